"""Shared by the benchmark scripts: print a results table and write the same text to its file, so
no number in a results file is typed by hand."""

from __future__ import annotations


def publish(lines: list[str], path: str) -> str:
    text = "\n".join(lines).rstrip("\n") + "\n"
    print(text)
    with open(path, "w", encoding="utf-8") as fh:
        fh.write(text)
    return text
