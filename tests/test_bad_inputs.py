"""Every class of bad input ends in a clear message and exit code 2, never a traceback.
(Common practice, no external source.)"""

from __future__ import annotations

import pytest

from bad_inputs import BAD_CASES, GOOD
from fekt.cli.main import main


def test_good_case_solves(tmp_path, capsys):
    p = tmp_path / "good.toml"
    p.write_text(GOOD)
    assert main(["solve", str(p), "--no-estimate"]) == 0


@pytest.mark.parametrize("name,text,words", BAD_CASES, ids=[c[0] for c in BAD_CASES])
def test_bad_input_message_and_exit_code(name, text, words, tmp_path, capsys):
    p = tmp_path / "bad.toml"
    p.write_text(text)
    assert main(["solve", str(p), "--no-estimate"]) == 2
    err = capsys.readouterr().err
    assert err.startswith("fekt: error: ") and "Traceback" not in err
    assert str(p) in err  # names the file
    assert words in err, err


def test_debug_shows_the_traceback(tmp_path):
    p = tmp_path / "bad.toml"
    p.write_text(BAD_CASES[1][1])
    with pytest.raises(Exception):
        main(["--debug", "solve", str(p)])
