"""The one exception the application raises for bad user input."""


class InputError(ValueError):
    """Bad input from a user: a one-line message naming the file, key or option and its range."""
