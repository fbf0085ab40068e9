"""The preseason outlook: each returning player's chances of each role next season.

In
    Placements of every season and the fitted model (:mod:`drift.model`).
Out
    :class:`RoleOutlook` (next-season role chances and expected position, fitted on
    the league's own season pairs with a conditional logit, ``_logit``) and the
    :class:`Backtest` (the outlook refitted on earlier seasons only and scored on
    each later one beside naive forecasts).
"""

from drift.outlook.backtest import Backtest, backtest, season_outlook
from drift.outlook.forecast import OUTLOOK_COLUMNS, RoleOutlook

__all__ = ["RoleOutlook", "OUTLOOK_COLUMNS", "Backtest", "backtest", "season_outlook"]
