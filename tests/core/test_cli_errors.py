"""A mistake on the command line is one line on stderr and exit status 2, as every other bad
value: argparse's own mistakes (missing or unknown arguments, a choice not offered) too."""

from __future__ import annotations

import pytest

from shopterm.cli import main


@pytest.mark.parametrize("argv, says", [
    (["--bogus"], "unrecognized arguments: --bogus"),
    (["calc", "limits"], "the following arguments are required: SPEC"),
    (["calc", "limits", "M10", "--units", "ft"], "invalid choice: 'ft'"),
    (["calc", "nothing"], "invalid choice: 'nothing'"),
    (["--config"], "expected one argument"),
])
def test_argument_mistakes_are_one_line_and_exit_2(capsys, argv, says):
    with pytest.raises(SystemExit) as info:
        main(argv)
    assert info.value.code == 2
    err = capsys.readouterr().err
    assert err.count("\n") == 1 and err.endswith("\n"), err      # one line
    assert says in err
    assert "usage:" not in err
    assert err.startswith("shopterm") and "--help'" in err       # where to read the usage


def test_help_still_prints_the_usage(capsys):
    with pytest.raises(SystemExit) as info:
        main(["--help"])
    assert info.value.code == 0
    assert "usage: shopterm" in capsys.readouterr().out
