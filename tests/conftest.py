"""Shared fixtures: the committed demo league, fitted once per session, and small tables."""

from __future__ import annotations

from pathlib import Path

import numpy as np
import pandas as pd
import pytest
import sklearn.cluster  # noqa: F401  (loads scikit-learn's OpenMP runtime so the limit below reaches it)
from threadpoolctl import threadpool_limits

# Many tiny K-means and linear-algebra calls: one math-library thread each is
# faster than an OpenMP region per call, and it cannot be slowed to a crawl by
# other work on a busy 2-core machine. Tests that call the selection rules
# directly (outside the API's own limit) need this too: a pool that is not loaded
# yet cannot be limited, hence the import above.
_THREADS = threadpool_limits(limits=1)

ROOT = Path(__file__).resolve().parent.parent
DEMO = ROOT / "demo_seasons"

#: role and position labels that existing rating services publish and drift must not reuse in its
#: role names, the demo's archetypes, the simulated profiles or the docs: whole phrases, and
#: ``combo`` as a word anywhere in a name (the list of issue 23)
BORROWED_LABELS = ("primary ball handler", "slasher", "movement shooter", "stretch big", "perimeter stopper",
                   "combo")


def borrowed_labels(text: str) -> list:
    """The :data:`BORROWED_LABELS` that ``text`` uses as words (case, hyphens, underscores and plurals ignored)."""
    import re

    plain = re.sub(r"[-_\s]+", " ", text.lower())
    return [label for label in BORROWED_LABELS if re.search(rf"\b{label}s?\b", plain)]


class _SharedFits:
    """Each distinct fit runs once per test run: ``RoleModel.fit`` memoised on its data and settings.

    The key is everything a fit depends on (the pool's rows, the features, every model setting and
    the intake policy), so a hit returns exactly the model the fit would have made; the warnings the
    real fit raised are raised again on every hit. The demo league is fitted by several fixtures,
    the CLI, the API and the docs' example with the same settings: once is enough. Tests marked
    ``refit`` (determinism checks) always fit for real.
    """

    def __init__(self):
        self.enabled = True
        self.store = {}
        self.fits = 0

    def key(self, model, pool, features, intake):
        import json

        values = pd.util.hash_pandas_object(pool, index=False).to_numpy()
        intake_key = None if intake is None else json.dumps(intake.to_dict(), sort_keys=True, default=str)
        return (tuple(pool.columns), len(pool), values.tobytes(), tuple(features),
                json.dumps(model.settings.to_dict(), sort_keys=True, default=str), intake_key)

    def install(self):
        import copy
        import warnings

        from drift.model.estimator import RoleModel

        real_fit = RoleModel.fit
        shared = self

        def fit(model, pool, *, features, intake=None):
            if not shared.enabled:
                return real_fit(model, pool, features=features, intake=intake)
            key = shared.key(model, pool, features, intake)
            if key not in shared.store:
                with warnings.catch_warnings(record=True) as caught:
                    warnings.simplefilter("always")
                    real_fit(model, pool, features=features, intake=intake)
                shared.fits += 1
                shared.store[key] = (copy.deepcopy(model.__dict__), [(w.message, w.category) for w in caught])
            state, said = shared.store[key]
            model.__dict__.update(copy.deepcopy(state))
            for message, category in said:
                warnings.warn(message, category, stacklevel=2)
            return model

        fit.__doc__ = real_fit.__doc__
        RoleModel.fit = fit


SHARED_FITS = _SharedFits()
SHARED_FITS.install()


@pytest.fixture(autouse=True)
def _fit_for_real_when_marked(request):
    """Tests marked ``refit`` check that fitting itself is deterministic: no shared fits for them."""
    if request.node.get_closest_marker("refit") is None:
        yield
        return
    SHARED_FITS.enabled = False
    try:
        yield
    finally:
        SHARED_FITS.enabled = True


@pytest.fixture(scope="session")
def demo_truth():
    return pd.read_csv(DEMO / "truth" / "truth.csv", dtype={"season": str})


@pytest.fixture(scope="session")
def demo_prepared():
    from drift.api import prepare

    return prepare(DEMO)


#: the demo league's points-per-possession columns on few possessions are noise by construction
#: (its players differ little in efficiency): every fit of it names the ones near zero in a warning.
#: That one warning (about ppp_ columns only) is expected wherever the demo is fitted; the fixture
#: below checks it is raised, tests/test_noise.py checks the rule, and any other warning still fails.
DEMO_UNRELIABLE = r"ppp_roll_man \(signal share 0.0"


def pytest_configure(config):
    config.addinivalue_line(
        "filterwarnings",
        r"ignore:\d+ feature\(s\) carry almost no signal[^;]*zero. (ppp_\w+ \([^)]*\),? ?)+;"
        ":drift.errors.UnreliableFeatureWarning")


@pytest.fixture(scope="session")
def demo_model(demo_prepared):
    from drift.api import fit_model
    from drift.errors import UnreliableFeatureWarning

    with pytest.warns(UnreliableFeatureWarning, match=DEMO_UNRELIABLE):
        return fit_model(demo_prepared)


#: the one comparison every shared demo run makes, so the in-process analysis and the CLI run
#: below write the same files
DEMO_COMPARE = ("2019-20", "2024-25")


@pytest.fixture(scope="session")
def demo_analysis(demo_prepared, demo_model):
    from drift.api import analyse
    from drift.config import Config

    return analyse(demo_prepared, demo_model, Config(compare=DEMO_COMPARE))


@pytest.fixture(scope="session")
def demo_run(tmp_path_factory):
    """``drift run`` on the demo league through the CLI, once per session: (exit code, out folder).

    With the two pipelines above this is the suite's third and last full fit of the demo league.
    """
    from drift.cli import main

    out = tmp_path_factory.mktemp("run") / "report"
    code = main(["run", str(DEMO), "--out", str(out), "--compare", *DEMO_COMPARE])
    return code, out


@pytest.fixture(scope="session")
def small_run(demo_run, tmp_path_factory):
    """A cheap CLI run on two seasons with fixed counts, carrying ids from the demo run's model."""
    from drift.cli import main

    out = tmp_path_factory.mktemp("small") / "report"
    code = main(["run", str(DEMO), "--out", str(out), "--roles", "4", "--components", "3",
                 "--reference", "2023-24", "2024-25", "--previous", str(demo_run[1] / "model.json")])
    return code, out


def small_table(n_players=6, seasons=("2021-22", "2022-23"), seed=0):
    """A tiny hand-sized season table with the standard columns and four features."""
    rng = np.random.default_rng(seed)
    rows = []
    for s in seasons:
        for i in range(n_players):
            rows.append({"player_id": f"P{i}", "player": f"Player {i}", "season": s, "team": "AAA",
                         "games": 60, "minutes": 1500, "share_spot_up": rng.uniform(0.1, 0.5),
                         "ppp_spot_up": rng.uniform(0.8, 1.2), "usage_pct": rng.uniform(12, 30),
                         "ts_pct": rng.uniform(0.5, 0.62)})
    return pd.DataFrame(rows)


@pytest.fixture
def write_csv(tmp_path):
    def _write(frame, name="2021-22.csv"):
        path = tmp_path / name
        frame.to_csv(path, index=False)
        return path
    return _write


#: fixtures that fit or run the whole demo league: a test that needs one is slow by construction
_DEMO_FIXTURES = {"demo_prepared", "demo_model", "demo_analysis", "demo_run", "small_run"}


def pytest_collection_modifyitems(config, items):
    """Mark every test that needs a demo fit or run as ``slow``: ``-m 'not slow'`` is the fast inner loop."""
    for item in items:
        if _DEMO_FIXTURES & set(getattr(item, "fixturenames", ())):
            item.add_marker(pytest.mark.slow)
