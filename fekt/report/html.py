"""A self-contained HTML report: a small view model and its renderer.

The view model is generic: a :class:`Document` holds a title and a sequence of blocks (headings,
paragraphs, key-value tables, data tables, figures, preformatted text, warnings, caution boxes,
provenance). Whoever builds a report turns results into these blocks with text already formatted
(see :mod:`fekt.report.units` for numbers); :func:`render` only lays them out.

The output is one HTML file that needs nothing else:

* figures are embedded -- PNG as ``data:`` URIs, SVG inline (checked: no scripts, no event handlers,
  no links outside the figure; element ids prefixed per figure so two figures cannot clash);
* the style sheet is inline and uses fonts installed on the reader's machine; no script at all;
* a Content-Security-Policy meta tag forbids the browser to load anything except ``data:`` images;
* print rules for A4 paper: page size and margins, headings kept with what follows, figures,
  short tables and boxes not split across pages, table headers repeated on each page.

Every piece of text is HTML-escaped by the template engine (jinja2 with autoescape). Control
characters (C0 other than tab and newline, DEL, C1) and the bidirectional override/isolate characters
are removed from all text first, so a case name cannot hide or reorder what the reader sees.
"""

from __future__ import annotations

import base64
import re
import xml.etree.ElementTree as ET
from dataclasses import dataclass
from typing import ClassVar

PNG_SIGNATURE = b"\x89PNG\r\n\x1a\n"
#: a table with at most this many rows is kept on one printed page
KEEP_TOGETHER_ROWS = 30

# --- text cleaning -------------------------------------------------------------------------------

_BIDI = "\u202a\u202b\u202c\u202d\u202e\u2066\u2067\u2068\u2069\u200e\u200f\u061c"
_REMOVE = dict.fromkeys([c for c in range(0x20) if c not in (0x09, 0x0A)] + list(range(0x7F, 0xA0))
                        + [ord(c) for c in _BIDI])
_REMOVE.update(dict.fromkeys(range(0xD800, 0xE000), "\ufffd"))  # a lone surrogate cannot be written as UTF-8


# terminal escape sequences (ECMA-48): CSI "ESC [" or C1 CSI ... final byte; OSC/DCS/PM/APC strings up to
# BEL or ST; any other two-character escape
_ESCAPES = re.compile(r"(?:\x1b\[|\x9b)[0-?]*[ -/]*[@-~]|(?:\x1b[\]P^_]|[\x90\x9d\x9e\x9f])[^\x07\x1b\x9c]*(?:\x07|\x1b\\|\x9c)?"
                      r"|\x1b[ -/]*[0-~]")


def clean_text(text: str) -> str:
    """Text safe to show: CR LF and lone CR become LF; terminal escape sequences (colour codes and the
    like) are removed whole; other control characters and bidirectional-override characters are
    removed; unpaired surrogates (not encodable as UTF-8) become U+FFFD."""
    s = str(text).replace("\r\n", "\n").replace("\r", "\n")
    return _ESCAPES.sub("", s).translate(_REMOVE)


def _anchor(text: str) -> str:
    return re.sub(r"[^A-Za-z0-9_-]+", "-", str(text)).strip("-")


# --- the view model ------------------------------------------------------------------------------

def _tuple(obj, name: str) -> None:
    """Store a list argument as a tuple (frozen dataclasses stay hashable and unchangeable)."""
    value = getattr(obj, name)
    if isinstance(value, (list, tuple)):
        object.__setattr__(obj, name, tuple(tuple(v) if isinstance(v, list) else v for v in value))


def _cell(value, where: str) -> str:
    if isinstance(value, bool) or not isinstance(value, (str, int)):
        raise TypeError(f"{where}: cells are text (format numbers first), got {type(value).__name__} {value!r}")
    return str(value)


def _pairs(rows, where: str) -> tuple[tuple[str, str], ...]:
    out = []
    for i, row in enumerate(rows):
        if len(row) != 2:
            raise ValueError(f"{where} row {i}: expected (key, value), got {row!r}")
        out.append((_cell(row[0], f"{where} row {i}"), _cell(row[1], f"{where} row {i}")))
    return tuple(out)


@dataclass(frozen=True)
class Heading:
    """A section heading; level 2 (section) to 4. ``anchor`` becomes the element id."""

    kind: ClassVar[str] = "heading"
    text: str
    level: int = 2
    anchor: str = ""

    def __post_init__(self):
        if self.level not in (2, 3, 4):
            raise ValueError(f"heading level must be 2, 3 or 4 (1 is the document title), got {self.level}")


@dataclass(frozen=True)
class Paragraph:
    """Running text; blank lines separate paragraphs, single newlines are spaces."""

    kind: ClassVar[str] = "paragraph"
    text: str


@dataclass(frozen=True)
class KeyValues:
    """A two-column table of named values (inputs, parameters)."""

    kind: ClassVar[str] = "keyvalues"
    rows: tuple[tuple[str, str], ...]
    caption: str = ""

    def __post_init__(self):
        object.__setattr__(self, "rows", _pairs(self.rows, "key-value table"))


@dataclass(frozen=True)
class Table:
    """A data table of preformatted text cells.

    ``numeric[j]``: column j is right-aligned with tabular digits. ``emphasis[i]``: row i is
    highlighted (e.g. the leading peak). Both may be empty (no numeric columns, no emphasis).
    ``anchor`` becomes the table's id (tests and links find it by that).
    """

    kind: ClassVar[str] = "table"
    headers: tuple[str, ...]
    rows: tuple[tuple[str, ...], ...]
    numeric: tuple[bool, ...] = ()
    emphasis: tuple[bool, ...] = ()
    caption: str = ""
    note: str = ""
    anchor: str = ""

    def __post_init__(self):
        for name in ("headers", "rows", "numeric", "emphasis"):
            _tuple(self, name)
        n = len(self.headers)
        if n == 0:
            raise ValueError("a table needs at least one column")
        object.__setattr__(self, "headers", tuple(_cell(h, "table header") for h in self.headers))
        rows = []
        for i, row in enumerate(self.rows):
            if len(row) != n:
                raise ValueError(f"table row {i} has {len(row)} cells, the header {n}")
            rows.append(tuple(_cell(c, f"table row {i}") for c in row))
        object.__setattr__(self, "rows", tuple(rows))
        if self.numeric and len(self.numeric) != n:
            raise ValueError(f"numeric flags: {len(self.numeric)} given for {n} columns")
        if self.emphasis and len(self.emphasis) != len(self.rows):
            raise ValueError(f"emphasis flags: {len(self.emphasis)} given for {len(self.rows)} rows")

    def is_numeric(self, j: int) -> bool:
        return bool(self.numeric and self.numeric[j])

    def is_emphasised(self, i: int) -> bool:
        return bool(self.emphasis and self.emphasis[i])


@dataclass(frozen=True)
class Figure:
    """A figure: PNG bytes or SVG text (exactly one), a caption, and alt text describing it."""

    kind: ClassVar[str] = "figure"
    caption: str
    alt: str
    png: bytes | None = None
    svg: str | None = None
    anchor: str = ""

    def __post_init__(self):
        if (self.png is None) == (self.svg is None):
            raise ValueError("a figure holds exactly one of png (bytes) or svg (text)")
        if self.png is not None and not bytes(self.png).startswith(PNG_SIGNATURE):
            raise ValueError("png: these bytes are not a PNG image (signature missing)")
        if not str(self.alt).strip():
            raise ValueError("a figure needs alt text (what it shows, for readers who cannot see it)")


@dataclass(frozen=True)
class Preformatted:
    """Text shown as is in a fixed-width font (e.g. the case file), lines wrapped when printed."""

    kind: ClassVar[str] = "preformatted"
    text: str
    caption: str = ""


@dataclass(frozen=True)
class WarningList:
    """Warnings raised by the run, one item each; an empty list says "none"."""

    kind: ClassVar[str] = "warnings"
    items: tuple[str, ...]
    title: str = "Warnings"

    def __post_init__(self):
        _tuple(self, "items")
        object.__setattr__(self, "items", tuple(_cell(s, "warning") for s in self.items))


@dataclass(frozen=True)
class Caution:
    """A boxed statement the reader must not miss (limits of validity of the numbers)."""

    kind: ClassVar[str] = "caution"
    text: str
    title: str = "Caution"


@dataclass(frozen=True)
class Provenance:
    """Where the numbers come from: versions, case hash, times. Set in small type at the end."""

    kind: ClassVar[str] = "provenance"
    rows: tuple[tuple[str, str], ...]
    title: str = "Provenance"

    def __post_init__(self):
        object.__setattr__(self, "rows", _pairs(self.rows, "provenance"))


Block = Heading | Paragraph | KeyValues | Table | Figure | Preformatted | WarningList | Caution | Provenance
BLOCK_TYPES = (Heading, Paragraph, KeyValues, Table, Figure, Preformatted, WarningList, Caution, Provenance)


@dataclass(frozen=True)
class Document:
    """A whole report. ``demo``: the data are invented (a banner says so on screen and on paper)."""

    title: str
    blocks: tuple[Block, ...] = ()
    subtitle: str = ""
    demo: bool = False
    footer: str = ""

    def __post_init__(self):
        _tuple(self, "blocks")
        for i, b in enumerate(self.blocks):
            if not isinstance(b, BLOCK_TYPES):
                raise TypeError(f"block {i}: {type(b).__name__} is not a report block "
                                f"({', '.join(t.__name__ for t in BLOCK_TYPES)})")


# --- figures -------------------------------------------------------------------------------------

def png_data_uri(png: bytes) -> str:
    return "data:image/png;base64," + base64.b64encode(bytes(png)).decode("ascii")


_SVG_NS = "{http://www.w3.org/2000/svg}"
_FORBIDDEN_TAGS = {"script", "foreignObject", "iframe", "object", "embed", "audio", "video", "a", "feImage"}
_EMBEDDED_IMAGE = re.compile(r"data:image/(png|jpeg);base64,[A-Za-z0-9+/=\s]*\Z")
_EXTERNAL = re.compile(r"url\(\s*['\"]?(?!#)|@import|javascript:", re.I)


def _local(tag: str) -> str:
    return tag.rsplit("}", 1)[-1]


def inline_svg(svg: str, prefix: str) -> str:
    """SVG text ready to be placed inside HTML: the XML prolog, comments and metadata removed, checked
    to reference nothing outside itself, every id prefixed with ``prefix``. Raises ValueError otherwise."""
    text = str(svg)
    text = re.sub(r"<\?xml[^>]*\?>", "", text)
    text = re.sub(r"<!DOCTYPE[^>]*(\[.*?\])?\s*>", "", text, flags=re.S)
    text = re.sub(r"<!--.*?-->", "", text, flags=re.S)
    text = re.sub(r"<metadata\b.*?</metadata>", "", text, flags=re.S).strip()
    try:
        root = ET.fromstring(text)
    except ET.ParseError as err:
        raise ValueError(f"svg: not well-formed XML ({err})") from None
    if root.tag != _SVG_NS + "svg":
        raise ValueError(f"svg: the root element is {root.tag!r}, not an SVG <svg> element")
    ids = set()
    for el in root.iter():
        tag = _local(el.tag)
        if tag in _FORBIDDEN_TAGS:
            raise ValueError(f"svg: <{tag}> elements are not allowed in a report figure")
        for name, value in el.attrib.items():
            local = _local(name)
            if local.lower().startswith("on"):
                raise ValueError(f"svg: event handler attribute {local!r} is not allowed")
            if local == "href" and not (value.startswith("#") or (tag == "image" and _EMBEDDED_IMAGE.match(value))):
                raise ValueError(f"svg: link {value[:60]!r} points outside the figure")
            if _EXTERNAL.search(value):
                raise ValueError(f"svg: attribute {local!r} refers outside the figure")
            if local == "id":
                ids.add(value)
        if tag == "style" and el.text and _EXTERNAL.search(el.text):
            raise ValueError("svg: a <style> element refers outside the figure")
    if ids:
        alternatives = "|".join(re.escape(i) for i in sorted(ids, key=len, reverse=True))
        text = re.sub(r'(\bid=)(["\'])(' + alternatives + r')\2', lambda m: f"{m[1]}{m[2]}{prefix}{m[3]}{m[2]}", text)
        text = re.sub(r'(href=)(["\'])#(' + alternatives + r')\2', lambda m: f"{m[1]}{m[2]}#{prefix}{m[3]}{m[2]}",
                      text)
        text = re.sub(r"url\(\s*#(" + alternatives + r")\s*\)", lambda m: f"url(#{prefix}{m[1]})", text)
    return text


# --- rendering -----------------------------------------------------------------------------------

def _environment():
    import jinja2
    from markupsafe import Markup

    def finalize(value):
        if isinstance(value, Markup):
            return value
        return clean_text(value) if isinstance(value, str) else value

    env = jinja2.Environment(loader=jinja2.PackageLoader("fekt.report", "templates"), autoescape=True,
                             finalize=finalize, undefined=jinja2.StrictUndefined, trim_blocks=True,
                             lstrip_blocks=True, keep_trailing_newline=True)
    env.filters["png_data_uri"] = png_data_uri
    env.filters["inline_svg"] = lambda svg, n: Markup(inline_svg(svg, f"fig{n}-"))
    env.filters["anchor"] = _anchor
    env.filters["paragraphs"] = lambda text: [p for p in re.split(r"\n\s*\n", clean_text(text)) if p.strip()]
    return env


def render(document: Document) -> str:
    """The report as one HTML5 page (a str; write it as UTF-8)."""
    if not isinstance(document, Document):
        raise TypeError(f"render() takes a Document, got {type(document).__name__}")
    template = _environment().get_template("report.html.j2")
    return template.render(doc=document, keep_rows=KEEP_TOGETHER_ROWS)
