"""The quick start stays true: .ci/run runs the README's test command, and the demo case exists."""

import os
import re

ROOT = os.path.dirname(os.path.dirname(os.path.abspath(__file__)))


def _commands():
    text = open(os.path.join(ROOT, "README.md"), encoding="utf-8").read()
    return re.findall(r"```sh\n(.*?)\n```", text, re.S)


def test_readme_has_two_commands_and_ci_runs_the_test_one():
    cmds = _commands()
    assert len(cmds) == 2
    ci = open(os.path.join(ROOT, ".ci", "run"), encoding="utf-8").read()
    assert cmds[1].strip() in ci
    demo = re.search(r"fekt solve (\S+)", cmds[0]).group(1)
    assert os.path.isfile(os.path.join(ROOT, demo))
