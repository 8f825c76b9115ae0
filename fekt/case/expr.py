"""Safe arithmetic expressions for dimensions in case files.

A dimension in a case file is either a plain number or a short expression
string such as ``"D/2 - r"`` or ``"w * tan(30)"``.  Expressions are parsed
with :func:`ast.parse` and then checked node by node against a whitelist;
nothing is ever handed to ``eval``/``exec``/``compile``, so a case file
cannot run code, reach attributes or import modules.

Grammar (same precedence and associativity as Python)::

    expression := sum
    sum        := product (("+" | "-") product)*
    product    := unary (("*" | "/") unary)*
    unary      := ("+" | "-") unary | power
    power      := atom ("**" unary)?          # right-associative, binds
                                              # tighter than a leading sign:
                                              # -2**2 == -4
    atom       := NUMBER | NAME | call | "(" expression ")"
    call       := FUNCTION "(" expression ("," expression)* ")"
    NUMBER     := integer or decimal literal, optional exponent (1e-3)
    NAME       := a parameter name, or the constant ``pi``

Functions (positional arguments only)::

    sqrt(x)  abs(x)  min(x, ...)  max(x, ...)  radians(x)  degrees(x)
    sin(deg) cos(deg) tan(deg)                  -> angles IN DEGREES
    asin(x)  acos(x)  atan(x)  atan2(y, x)      -> results IN DEGREES

Trigonometry works in degrees throughout, because drawings dimension angles
in degrees; ``radians``/``degrees`` convert explicitly when needed.  sin and
cos return exact values at multiples of 30 degrees where those are exactly
representable (so ``cos(90)`` is 0, not 6e-17), and tan likewise at
multiples of 45 degrees; tan at an odd multiple of 90 degrees is an error.

Everything else is rejected: attribute access, subscripts, comparisons,
boolean operators, conditional expressions, lambdas, strings, containers,
keyword or starred arguments, ``//``, ``%`` and bitwise operators.

Limits keep a hostile or mistyped case file from burning CPU or producing
nonsense: at most :data:`MAX_LENGTH` characters, a syntax tree at most
:data:`MAX_DEPTH` levels deep, exponents with magnitude at most
:data:`MAX_EXPONENT`, and every intermediate result must be finite
(division by zero, overflow and NaN are errors).

Every failure raises :class:`fekt.errors.CaseError` naming the item, the
expression text and the rule that was broken.
"""

from __future__ import annotations

import ast
import difflib
import keyword
import math
import unicodedata
from collections.abc import Callable, Mapping
from dataclasses import dataclass
from types import MappingProxyType
from typing import NamedTuple

from fekt.errors import CaseError

__all__ = [
    "CONSTANTS",
    "FUNCTIONS",
    "MAX_DEPTH",
    "MAX_EXPONENT",
    "MAX_LENGTH",
    "RESERVED_NAMES",
    "evaluate",
    "resolve_parameters",
]

MAX_LENGTH = 500
MAX_DEPTH = 30
MAX_EXPONENT = 100.0

# Only pi: a constant named "e" would collide with the common use of e as an
# eccentricity or offset parameter.
# Read-only views: the tables are shared module constants, not state.
CONSTANTS: Mapping[str, float] = MappingProxyType({"pi": math.pi})


# --------------------------------------------------------------------------
# Functions.  Each implementation signals an argument outside its domain by
# raising ValueError; the evaluator turns that into a CaseError that can name
# the expression, which the implementation itself does not know.
# --------------------------------------------------------------------------

# Exactly representable values only, keyed by whole degrees in [0, 360).
_EXACT_SIN = {0: 0.0, 30: 0.5, 90: 1.0, 150: 0.5, 180: 0.0, 210: -0.5, 270: -1.0, 330: -0.5}
_EXACT_COS = {0: 1.0, 60: 0.5, 90: 0.0, 120: -0.5, 180: -1.0, 240: -0.5, 270: 0.0, 300: 0.5}
# tan has period 180, so its table is keyed by whole degrees in [0, 180).
_EXACT_TAN = {0: 0.0, 45: 1.0, 135: -1.0}


def _exact_value(reduced: float, table: Mapping[int, float]) -> float | None:
    """Look up an exact value for an already reduced angle, if there is one."""
    if reduced.is_integer():
        return table.get(int(reduced))
    return None


def _sin_deg(angle: float) -> float:
    # Reducing first keeps large angles accurate and lets whole-degree
    # special cases be recognised exactly.
    reduced = angle % 360.0
    exact = _exact_value(reduced, _EXACT_SIN)
    return exact if exact is not None else math.sin(math.radians(reduced))


def _cos_deg(angle: float) -> float:
    reduced = angle % 360.0
    exact = _exact_value(reduced, _EXACT_COS)
    return exact if exact is not None else math.cos(math.radians(reduced))


def _tan_deg(angle: float) -> float:
    reduced = angle % 180.0
    if reduced == 90.0:
        # math.tan would return ~1.6e16 here, a silently absurd dimension.
        raise ValueError("tan is undefined at odd multiples of 90 degrees")
    exact = _exact_value(reduced, _EXACT_TAN)
    return exact if exact is not None else math.tan(math.radians(reduced))


def _asin_deg(x: float) -> float:
    return math.degrees(math.asin(x))


def _acos_deg(x: float) -> float:
    return math.degrees(math.acos(x))


def _atan_deg(x: float) -> float:
    return math.degrees(math.atan(x))


def _atan2_deg(y: float, x: float) -> float:
    return math.degrees(math.atan2(y, x))


def _min_of(*values: float) -> float:
    # builtins.min(x) with one argument expects an iterable; the expression
    # language treats min(x) as x.
    return min(values)


def _max_of(*values: float) -> float:
    return max(values)


class _Function(NamedTuple):
    impl: Callable[..., float]
    min_args: int
    max_args: int | None  # None: any number of arguments from min_args up


FUNCTIONS: Mapping[str, _Function] = MappingProxyType({
    "sqrt": _Function(math.sqrt, 1, 1),
    "sin": _Function(_sin_deg, 1, 1),
    "cos": _Function(_cos_deg, 1, 1),
    "tan": _Function(_tan_deg, 1, 1),
    "asin": _Function(_asin_deg, 1, 1),
    "acos": _Function(_acos_deg, 1, 1),
    "atan": _Function(_atan_deg, 1, 1),
    "atan2": _Function(_atan2_deg, 2, 2),
    "abs": _Function(abs, 1, 1),
    "min": _Function(_min_of, 1, None),
    "max": _Function(_max_of, 1, None),
    "radians": _Function(math.radians, 1, 1),
    "degrees": _Function(math.degrees, 1, 1),
})

RESERVED_NAMES = frozenset(CONSTANTS) | frozenset(FUNCTIONS)

_BINARY_OPS: Mapping[type, str] = {
    ast.Add: "+",
    ast.Sub: "-",
    ast.Mult: "*",
    ast.Div: "/",
    ast.Pow: "**",
}
_UNARY_OPS: Mapping[type, str] = {ast.UAdd: "+", ast.USub: "-"}

# Friendly names for constructs that parse as Python but are not allowed,
# so the user learns what to remove instead of seeing an AST class name.
_FORBIDDEN_NAMES: Mapping[type, str] = {
    ast.Attribute: "attribute access",
    ast.Subscript: "subscripts",
    ast.Slice: "slices",
    ast.Compare: "comparisons",
    ast.BoolOp: "boolean operators (and/or)",
    ast.IfExp: "conditional expressions",
    ast.Lambda: "lambda expressions",
    ast.NamedExpr: "assignment expressions",
    ast.List: "lists",
    ast.Tuple: "tuples",
    ast.Set: "sets",
    ast.Dict: "dictionaries",
    ast.ListComp: "comprehensions",
    ast.SetComp: "comprehensions",
    ast.DictComp: "comprehensions",
    ast.GeneratorExp: "generator expressions",
    ast.JoinedStr: "f-strings",
    ast.FormattedValue: "f-strings",
    ast.Starred: "starred arguments",
    ast.Await: "await",
    ast.Yield: "yield",
    ast.YieldFrom: "yield",
}
_BINARY_OP_NAMES: Mapping[type, str] = {
    ast.FloorDiv: "//",
    ast.Mod: "%",
    ast.MatMult: "@",
    ast.LShift: "<<",
    ast.RShift: ">>",
    ast.BitOr: "|",
    ast.BitXor: "^",
    ast.BitAnd: "&",
}
_UNARY_OP_NAMES: Mapping[type, str] = {ast.Not: "not", ast.Invert: "~"}

_PREVIEW_LENGTH = 60


@dataclass(frozen=True)
class _Context:
    """What error messages need to know about the expression being handled."""

    text: str
    item: str


@dataclass(frozen=True)
class _Parsed:
    """A parsed expression that passed the whitelist and depth checks."""

    text: str  # stripped source, which error positions refer to
    body: ast.expr


# --------------------------------------------------------------------------
# Message helpers
# --------------------------------------------------------------------------


def _shorten(text: str) -> str:
    """Cut very long text so one bad value cannot flood an error message."""
    return text[:_PREVIEW_LENGTH] + "..." if len(text) > _PREVIEW_LENGTH else text


def _quote(text: str) -> str:
    """Quote an expression for a message, shortening very long ones."""
    return repr(_shorten(text))


def _fmt(x: float) -> str:
    return format(x, ".12g")


def _char_column(text: str, lineno: int, byte_offset: int) -> int:
    """1-based character column of an AST node.

    ast reports col_offset in UTF-8 bytes; users count characters.
    """
    lines = text.split("\n")
    line = lines[lineno - 1] if 0 < lineno <= len(lines) else ""
    return len(line.encode("utf-8")[:byte_offset].decode("utf-8", errors="ignore")) + 1


def _where(text: str, lineno: int | None, column: int | None) -> str:
    """' at column N' (or ' at line L, column N'), or '' when unknown."""
    if not column or column < 1:
        return ""
    if "\n" in text and lineno:
        return f" at line {lineno}, column {column}"
    return f" at column {column}"


def _node_where(text: str, node: ast.AST) -> str:
    lineno = getattr(node, "lineno", None)
    offset = getattr(node, "col_offset", None)
    if lineno is None or offset is None:
        return ""
    return _where(text, lineno, _char_column(text, lineno, offset))


def _did_you_mean(name: str, candidates: list[str]) -> str | None:
    matches = difflib.get_close_matches(name, candidates, n=3)
    if not matches:
        return None
    return "did you mean " + " or ".join(repr(m) for m in matches) + "?"


def _fail(ctx: _Context, rule: str, node: ast.AST | None = None, hint: str | None = None) -> CaseError:
    where = _node_where(ctx.text, node) if node is not None else ""
    return CaseError(f"{rule} in expression {_quote(ctx.text)}{where}", item=ctx.item, hint=hint)


# --------------------------------------------------------------------------
# Parsing and static checks
# --------------------------------------------------------------------------


def _as_number(value: object, item: str) -> float:
    """Return a plain (non-string) case-file value as a finite float.

    bool is rejected although Python treats it as an int: in a case file it
    almost always means a mistyped value.
    """
    if isinstance(value, bool):
        raise CaseError(
            f"expected a number or an expression string, got the boolean {value!r}",
            item=item,
            hint="write a number such as 2.5 or an expression such as 'D/2'",
        )
    if not isinstance(value, (int, float)):
        raise CaseError(
            f"expected a number or an expression string, got {_shorten(repr(value))} ({type(value).__name__})",
            item=item,
            hint="write a number such as 2.5 or an expression such as 'D/2'",
        )
    try:
        number = float(value)
    except OverflowError:
        number = math.inf
    if not math.isfinite(number):
        raise CaseError(f"value {_shorten(repr(value))} is not a finite number", item=item)
    return number


def _parse(value: str, item: str) -> _Parsed:
    """Parse and statically check an expression string."""
    # Surrounding whitespace is common in hand-written files and would make
    # ast report an "unexpected indent"; positions refer to the stripped text.
    text = value.strip()
    ctx = _Context(text, item)
    if not text:
        raise CaseError("empty expression", item=item, hint="write a number or an expression such as 'D/2'")
    if len(text) > MAX_LENGTH:
        raise CaseError(
            f"expression {_quote(text)} is {len(text)} characters long; the limit is {MAX_LENGTH}",
            item=item,
            hint="split it into named parameters",
        )
    try:
        tree = ast.parse(text, mode="eval")
    except SyntaxError as exc:
        where = _where(text, exc.lineno, exc.offset)
        raise CaseError(f"syntax error in expression {_quote(text)}{where}: {exc.msg}", item=item) from None
    except (ValueError, RecursionError, MemoryError) as exc:
        # Older Pythons raise ValueError for NUL bytes; the others cannot
        # happen within MAX_LENGTH but must not escape as non-fekt errors.
        raise CaseError(f"cannot parse expression {_quote(text)}: {exc}", item=item) from None
    _check_tree(tree.body, ctx)
    return _Parsed(text, tree.body)


def _check_tree(root: ast.expr, ctx: _Context) -> None:
    """Reject any node outside the whitelist and any tree deeper than MAX_DEPTH.

    Iterative so that the check itself cannot hit the recursion limit.
    """
    stack: list[tuple[ast.expr, int]] = [(root, 1)]
    while stack:
        node, depth = stack.pop()
        if depth > MAX_DEPTH:
            raise _fail(
                ctx,
                f"expression is nested more than {MAX_DEPTH} levels deep",
                hint="split it into named parameters",
            )
        for child in _checked_children(node, ctx):
            stack.append((child, depth + 1))


def _checked_children(node: ast.expr, ctx: _Context) -> list[ast.expr]:
    """Validate one node and return its sub-expressions."""
    if isinstance(node, ast.Constant):
        _check_constant(node, ctx)
        return []
    if isinstance(node, ast.Name):
        return []
    if isinstance(node, ast.UnaryOp):
        if type(node.op) not in _UNARY_OPS:
            raise _fail(ctx, f"operator {_UNARY_OP_NAMES.get(type(node.op), '?')!r} is not allowed", node)
        return [node.operand]
    if isinstance(node, ast.BinOp):
        if type(node.op) not in _BINARY_OPS:
            symbol = _BINARY_OP_NAMES.get(type(node.op), "?")
            raise _fail(ctx, f"operator {symbol!r} is not allowed", node, hint="use + - * / ** only")
        return [node.left, node.right]
    if isinstance(node, ast.Call):
        _check_call(node, ctx)
        return list(node.args)
    what = _FORBIDDEN_NAMES.get(type(node), f"construct {type(node).__name__}")
    raise _fail(ctx, f"{what} not allowed", node, hint="only numbers, names, + - * / ** and functions are allowed")


def _check_constant(node: ast.Constant, ctx: _Context) -> None:
    value = node.value
    if type(value) is int or type(value) is float:
        # Literals such as 1e999 parse to inf; huge integer literals
        # overflow float().
        try:
            finite = math.isfinite(float(value))
        except OverflowError:
            finite = False
        if not finite:
            raise _fail(ctx, "number literal is too large", node)
        return
    if isinstance(value, (str, bytes)):
        raise _fail(ctx, "strings are not allowed", node, hint="remove the quotes inside the expression")
    if isinstance(value, complex):
        raise _fail(ctx, "complex numbers are not allowed", node)
    raise _fail(ctx, f"literal {value!r} is not allowed", node)


def _check_call(node: ast.Call, ctx: _Context) -> None:
    if not isinstance(node.func, ast.Name):
        raise _fail(ctx, "only calls of the built-in functions are allowed", node)
    name = node.func.id
    function = FUNCTIONS.get(name)
    if function is None:
        raise _fail(ctx, f"unknown function {name!r}", node, hint=_did_you_mean(name, sorted(FUNCTIONS)))
    if node.keywords:
        raise _fail(ctx, f"keyword arguments are not allowed in {name}()", node)
    count = len(node.args)
    if count < function.min_args or (function.max_args is not None and count > function.max_args):
        raise _fail(ctx, f"{name}() takes {_arity(function)}, got {count}", node)


def _arity(function: _Function) -> str:
    if function.max_args is None:
        return f"at least {function.min_args} argument{'s' if function.min_args != 1 else ''}"
    if function.min_args == function.max_args:
        return f"{function.min_args} argument{'s' if function.min_args != 1 else ''}"
    return f"{function.min_args} to {function.max_args} arguments"


def _name_nodes(parsed: _Parsed) -> list[ast.Name]:
    """Names used as values (not as called functions), in order of appearance."""
    called = {id(n.func) for n in ast.walk(parsed.body) if isinstance(n, ast.Call)}
    nodes = [n for n in ast.walk(parsed.body) if isinstance(n, ast.Name) and id(n) not in called]
    return sorted(nodes, key=lambda n: (n.lineno, n.col_offset))


# --------------------------------------------------------------------------
# Evaluation of a checked tree
# --------------------------------------------------------------------------


def _finite(result: float, ctx: _Context, node: ast.AST) -> float:
    if not math.isfinite(result):
        raise _fail(ctx, "result is not a finite number (overflow)", node)
    return result


def _compute(node: ast.expr, params: Mapping[str, float], ctx: _Context) -> float:
    # Recursion is bounded by MAX_DEPTH, already enforced by _check_tree.
    if isinstance(node, ast.Constant):
        return float(node.value)
    if isinstance(node, ast.Name):
        return _eval_name(node, params, ctx)
    if isinstance(node, ast.UnaryOp):
        operand = _compute(node.operand, params, ctx)
        return -operand if isinstance(node.op, ast.USub) else operand
    if isinstance(node, ast.BinOp):
        left = _compute(node.left, params, ctx)
        right = _compute(node.right, params, ctx)
        return _eval_binary(node, left, right, ctx)
    if isinstance(node, ast.Call):
        args = [_compute(arg, params, ctx) for arg in node.args]
        return _eval_call(node, args, ctx)
    # Unreachable after _check_tree; kept so a future gap in the whitelist
    # fails closed instead of evaluating something unexpected.
    raise _fail(ctx, f"construct {type(node).__name__} not allowed", node)


def _eval_name(node: ast.Name, params: Mapping[str, float], ctx: _Context) -> float:
    name = node.id
    if name in CONSTANTS:
        return CONSTANTS[name]
    if name in FUNCTIONS:
        raise _fail(ctx, f"{name!r} is a function and must be called, e.g. {name}(...)", node)
    if name not in params:
        known = sorted(params)
        hint = _did_you_mean(name, known + sorted(CONSTANTS))
        if hint is None:
            hint = ("known parameters: " + ", ".join(known)) if known else "no parameters are defined"
        raise _fail(ctx, f"unknown name {name!r}", node, hint=hint)
    value = params[name]
    if isinstance(value, bool) or not isinstance(value, (int, float)) or not math.isfinite(value):
        raise _fail(ctx, f"parameter {name!r} has no finite numeric value ({_shorten(repr(value))})", node)
    return float(value)


def _eval_binary(node: ast.BinOp, left: float, right: float, ctx: _Context) -> float:
    op = node.op
    if isinstance(op, ast.Add):
        return _finite(left + right, ctx, node)
    if isinstance(op, ast.Sub):
        return _finite(left - right, ctx, node)
    if isinstance(op, ast.Mult):
        return _finite(left * right, ctx, node)
    if isinstance(op, ast.Div):
        if right == 0.0:
            raise _fail(ctx, f"division by zero ({_fmt(left)} / 0)", node)
        return _finite(left / right, ctx, node)
    return _power(node, left, right, ctx)


def _power(node: ast.BinOp, base: float, exponent: float, ctx: _Context) -> float:
    if abs(exponent) > MAX_EXPONENT:
        raise _fail(ctx, f"exponent {_fmt(exponent)} exceeds the limit of {_fmt(MAX_EXPONENT)} in magnitude", node)
    if base == 0.0 and exponent < 0.0:
        raise _fail(ctx, f"division by zero (0 ** {_fmt(exponent)})", node)
    if base < 0.0 and not exponent.is_integer():
        # Python would return a complex number here.
        raise _fail(ctx, f"negative base {_fmt(base)} with non-integer exponent {_fmt(exponent)}", node)
    try:
        result = base**exponent
    except OverflowError:
        raise _fail(ctx, f"{_fmt(base)} ** {_fmt(exponent)} overflows", node) from None
    return _finite(result, ctx, node)


def _eval_call(node: ast.Call, args: list[float], ctx: _Context) -> float:
    if not isinstance(node.func, ast.Name):
        # Unreachable after _check_call; fail closed rather than guess.
        raise _fail(ctx, "only calls of the built-in functions are allowed", node)
    name = node.func.id
    call_text = f"{name}({', '.join(_fmt(a) for a in args)})"
    try:
        result = FUNCTIONS[name].impl(*args)
    except (ValueError, OverflowError, ZeroDivisionError):
        raise _fail(ctx, f"{call_text} is undefined (argument outside the function's domain)", node) from None
    if not math.isfinite(result):
        raise _fail(ctx, f"{call_text} is not a finite number", node)
    return float(result)


# --------------------------------------------------------------------------
# Public API
# --------------------------------------------------------------------------


def evaluate(value: object, params: Mapping[str, float], *, item: str) -> float:
    """Evaluate a case-file dimension.

    ``value`` is an int or float (returned as float) or an expression string
    using the grammar in the module docstring; ``params`` supplies the
    values of names.  Trig functions take and return degrees.  ``item``
    names the entry in error messages (e.g. ``"cutouts[1].diameter"``).

    Raises :class:`~fekt.errors.CaseError` for anything that is not a
    finite number or a valid, finite expression.
    """
    if not isinstance(value, str):
        return _as_number(value, item)
    parsed = _parse(value, item)
    _check_no_shadowing(params, item)
    return _compute(parsed.body, params, _Context(parsed.text, item))


def _check_no_shadowing(params: Mapping[str, float], item: str) -> None:
    clash = sorted(RESERVED_NAMES.intersection(params))
    if clash:
        raise CaseError(
            f"parameter name {clash[0]!r} is reserved for a built-in constant or function",
            item=item,
            hint="rename the parameter",
        )


def _check_parameter_name(name: object, item_prefix: str) -> str:
    if not isinstance(name, str):
        raise CaseError(f"parameter name {name!r} is not a string", item=item_prefix)
    item = f"{item_prefix}.{name}"
    if not name.isidentifier() or keyword.iskeyword(name):
        raise CaseError(
            f"parameter name {name!r} is not a valid identifier",
            item=item,
            hint="use letters, digits and underscores, not starting with a digit",
        )
    if unicodedata.normalize("NFKC", name) != name:
        # Python normalises identifiers in expressions, so this name could
        # never be referenced as written.
        raise CaseError(
            f"parameter name {name!r} is not in normalised form",
            item=item,
            hint=f"write it as {unicodedata.normalize('NFKC', name)!r}",
        )
    if name in RESERVED_NAMES:
        raise CaseError(
            f"parameter name {name!r} is reserved for a built-in constant or function",
            item=item,
            hint="rename the parameter",
        )
    return name


def _dependencies(parsed: Mapping[str, _Parsed], known: list[str], item_prefix: str) -> dict[str, list[str]]:
    """Map each expression parameter to the parameters it references.

    Fails on names that are neither parameters nor built-ins.
    """
    deps: dict[str, list[str]] = {}
    for name, expr in parsed.items():
        nodes = [n for n in _name_nodes(expr) if n.id not in RESERVED_NAMES]
        for node in nodes:
            if node.id not in known:
                hint = _did_you_mean(node.id, known + sorted(CONSTANTS))
                if hint is None:
                    hint = f"define {node.id!r} under {item_prefix!r}"
                ctx = _Context(expr.text, f"{item_prefix}.{name}")
                raise _fail(ctx, f"unknown name {node.id!r}", node, hint=hint)
        # dict.fromkeys: de-duplicate while keeping order of appearance.
        deps[name] = list(dict.fromkeys(n.id for n in nodes))
    return deps


def _evaluation_order(deps: Mapping[str, list[str]], item_prefix: str) -> list[str]:
    """Topological order of the parameters; fails naming a cycle.

    Iterative depth-first search, so long chains of parameters cannot hit
    the recursion limit.  Visiting in insertion order keeps errors stable.
    """
    done: set[str] = set()
    order: list[str] = []
    for start in deps:
        if start in done:
            continue
        path: list[str] = [start]
        on_path = {start}
        iterators = [iter(deps.get(start, []))]
        while iterators:
            nxt = next(iterators[-1], None)
            if nxt is None:
                finished = path.pop()
                on_path.discard(finished)
                iterators.pop()
                done.add(finished)
                order.append(finished)
            elif nxt in on_path:
                cycle = path[path.index(nxt) :] + [nxt]
                raise CaseError(
                    f"circular reference: {' -> '.join(cycle)}",
                    item=f"{item_prefix}.{nxt}",
                    hint="give one of these parameters a value that does not depend on the others",
                )
            elif nxt not in done:
                path.append(nxt)
                on_path.add(nxt)
                iterators.append(iter(deps.get(nxt, [])))
    return order


def resolve_parameters(raw: Mapping[str, object], *, item_prefix: str = "parameters") -> dict[str, float]:
    """Evaluate a table of named parameters that may reference each other.

    Values are numbers or expression strings (see the module docstring);
    they may refer to other parameters defined anywhere in ``raw``, in any
    order.  Returns the values as floats, in the order of ``raw``.

    Raises :class:`~fekt.errors.CaseError` for invalid names, names that
    shadow ``pi`` or a function, invalid expressions, references to unknown
    names (with a "did you mean" hint) and circular references (naming the
    cycle, e.g. ``a -> b -> a``).  Error items are ``f"{item_prefix}.{name}"``.
    """
    if not isinstance(raw, Mapping):
        raise CaseError(
            f"expected a table of name = value pairs, got {type(raw).__name__}",
            item=item_prefix,
        )
    names = [_check_parameter_name(name, item_prefix) for name in raw]
    numbers: dict[str, float] = {}
    parsed: dict[str, _Parsed] = {}
    for name in names:
        item = f"{item_prefix}.{name}"
        value = raw[name]
        if isinstance(value, str):
            parsed[name] = _parse(value, item)
        else:
            numbers[name] = _as_number(value, item)
    deps = _dependencies(parsed, names, item_prefix)
    resolved = dict(numbers)
    for name in _evaluation_order(deps, item_prefix):
        if name in parsed:
            expr = parsed[name]
            resolved[name] = _compute(expr.body, resolved, _Context(expr.text, f"{item_prefix}.{name}"))
    return {name: resolved[name] for name in names}
