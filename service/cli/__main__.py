"""``python -m stanchion.service.cli``: the command line."""

from stanchion.service.cli import run

run()
