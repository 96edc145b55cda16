"""The one error a user can cause here: a message of one line naming what is
wrong and what to do. __main__ prints it as `lumtrap plot: error: ...` and
exits with 1."""


class PlotError(Exception):
    pass
