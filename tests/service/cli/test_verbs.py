"""Every verb is registered from its own module; one that cannot be imported fails loudly."""

from __future__ import annotations

import pytest

from stanchion.service import cli


def test_every_verb_is_on_the_command_line(capsys) -> None:
    with pytest.raises(SystemExit):
        cli.main(["--help"])
    out = capsys.readouterr().out
    for verb in cli.VERBS:
        assert verb.replace("_", "-") in out  # module loads_template: verb loads-template
    # docs/design.md §4
    assert set(cli.VERBS) == {"check", "suggest", "requirements", "serve", "demo",
                              "loads_template"}


def test_a_verb_whose_module_is_missing_fails_loudly(monkeypatch) -> None:
    monkeypatch.setattr(cli, "VERBS", (*cli.VERBS, "no_such_verb"))
    with pytest.raises(ModuleNotFoundError, match="no_such_verb"):
        cli.build_parser()
