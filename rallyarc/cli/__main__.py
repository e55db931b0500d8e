"""``python -m rallyarc.cli``: the ``rallyarc`` command."""

from rallyarc.cli import main

if __name__ == "__main__":
    main()
