from .commands import main  # noqa: F401
