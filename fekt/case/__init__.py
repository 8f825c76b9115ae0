"""Case input: the schema, safe dimension expressions, value checks and the TOML case-file loader.

The public entry points with fekt's own models, loads and shapes are in :mod:`fekt.api`
(``fekt.load_case``)."""
