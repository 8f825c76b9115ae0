"""Case input: the schema, safe dimension expressions and the TOML case-file loader."""

from fekt.case.loader import load_case, parse_case

__all__ = ["load_case", "parse_case"]
