"""Role profiles of the simulated family, and the simulated player who carries one.

:mod:`drift.sim.family` draws leagues; this module holds what a league's roles are
made of: the library of twelve invented playstyle profiles (:data:`PROFILES`),
how a league picks and perturbs some of them (:func:`league_profiles`), which
other role a blended player leans towards (:func:`nearest_other`), and the
player whose true style is drawn around his role (:class:`SimPlayer`, shaped like
the demo's players so :func:`drift.sim.demo._observe` can observe him).

Everything is invented: the profiles are numbers written for this code.
"""

from __future__ import annotations

from drift.sim.demo import ARCHETYPES

__all__ = ["PROFILES", "SimPlayer", "league_profiles", "nearest_other"]

#: role profile -> (play-type shares in demo.PLAY_TYPES order, demo.RATES, demo.SHOOTING):
#: the demo league's seven archetypes (same values, same order), then five more
PROFILES = {
    **ARCHETYPES,
    "screen_runner": ((.02, .04, .00, .01, .30, .10, .06, .32, .13, .02),
                      (19, 10, 1.8, 10, 8.5, 1.2, 0.4), (.595, .62, .16)),
    "point_forward": ((.12, .20, .02, .14, .12, .12, .08, .02, .16, .02),
                      (22, 25, 5.5, 18, 13.5, 1.5, 1.0), (.550, .22, .30)),
    "ball_hawk_wing": ((.02, .03, .00, .01, .44, .28, .14, .02, .04, .02),
                       (12, 9, 3.5, 14, 8.5, 2.4, 1.4), (.570, .50, .18)),
    "energy_big": ((.00, .00, .20, .04, .03, .12, .26, .00, .03, .32),
                   (13, 6, 15.0, 25, 12.0, 1.4, 3.0), (.615, .01, .52)),
    "isolation_scorer": ((.36, .18, .00, .09, .12, .09, .04, .05, .05, .02),
                         (31, 17, 2.5, 12, 10.5, 1.2, 0.5), (.555, .34, .38)),
}


def league_profiles(spec, rng):
    """Pick ``n_roles`` profiles from the library and perturb them for this league."""
    import numpy as np

    names = list(PROFILES)
    chosen = sorted(rng.choice(len(names), size=spec.n_roles, replace=False))
    out = {}
    for i in chosen:
        shares, rates, shoot = (np.array(x, float) for x in PROFILES[names[i]])
        j = spec.profile_jitter
        shares = shares * np.exp(rng.normal(0, j * 1.5, len(shares))) + 0.002
        out[names[i]] = (shares / shares.sum(), rates * np.exp(rng.normal(0, j / 2, len(rates))),
                         shoot + rng.normal(0, j / 4, 3) * np.array([0.1, 0.5, 0.5]))
    return out


def nearest_other(profiles):
    """Role -> the other role nearest to it (on shares, rates and shooting in rough sd units)."""
    import numpy as np

    names = list(profiles)
    vec = np.array([np.concatenate([s / 0.08, r / np.array([5, 7, 3, 4, 2, .4, .8]), h / np.array([.03, .15, .08])])
                    for s, r, h in profiles.values()])
    d = ((vec[:, None] - vec[None]) ** 2).sum(axis=2)
    np.fill_diagonal(d, np.inf)
    return {n: names[int(np.argmin(d[i]))] for i, n in enumerate(names)}


class SimPlayer:
    """A player's truth, shaped like the demo's players so :func:`drift.sim.demo._observe` can draw from it."""

    def __init__(self, pid, name, role, rng, profiles, partner, blend_weight, spread):
        self.pid, self.name, self.profiles, self.spread = pid, name, profiles, spread
        self.skill = rng.normal(0.0, 0.05, 10)
        self.partner = partner
        self.blend_weight = blend_weight
        self.role = role
        self.changed = False
        self._restyle(rng)

    def _restyle(self, rng):
        import numpy as np

        shares, rates, shoot = self.profiles[self.role]
        if self.blend_weight > 0:
            w = self.blend_weight
            s2, r2, h2 = self.profiles[self.partner[self.role]]
            shares, rates, shoot = ((1 - w) * a + w * b for a, b in ((shares, s2), (rates, r2), (shoot, h2)))
        k = self.spread
        self.shares = rng.dirichlet(shares * 120 / k ** 2 + 0.05)
        self.rates = rates * np.exp(rng.normal(0, 0.08 * k, len(rates)))
        self.shoot = shoot + rng.normal(0, np.array([0.015, 0.035, 0.035]) * k)

    def age_one_season(self, rng):
        import numpy as np

        self.shares = rng.dirichlet(self.shares * 600 + 0.02)
        self.rates = self.rates * np.exp(rng.normal(0, 0.025, len(self.rates)))
        self.shoot = self.shoot + rng.normal(0, [0.006, 0.012, 0.012])

    def change_role(self, rng, weights=None, names=None):
        """A real change of role: to any other role, or by ``weights`` (over ``names``) when given."""
        others = [r for r in self.profiles if r != self.role]
        if weights is None:
            self.role = str(rng.choice(others))
        else:
            w = [weights[names.index(r)] for r in others]
            self.role = str(rng.choice(others, p=[v / sum(w) for v in w]))
        self.blend_weight = 0.0
        self._restyle(rng)
