"""fekt's version (kept apart from the package's ``__init__`` so that every stage may import it)."""

__version__ = "0.2.0"
