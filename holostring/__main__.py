"""``python -m holostring`` runs the command-line interface."""

from holostring.cli import main

if __name__ == "__main__":
    main()
