"""Charts for the report, rendered by matplotlib to inline SVG strings.

Each function takes tidy tables and returns an ``<svg>`` string; output is
deterministic (fixed hash salt, no date metadata) so a re-run gives the same bytes.
"""

from __future__ import annotations

from drift.constants import STABLE_JACCARD

__all__ = ["components_chart", "roles_chart", "role_map_chart", "drift_chart", "moves_chart",
           "reliability_chart", "ROLE_COLOURS", "STATUS_COLOURS", "MAX_POINTS", "sample_rows"]

#: drift's own role palette, chosen to stay apart under the common colour-vision deficiencies
#: (blue/orange/sky/plum/teal/mustard pairs differ in lightness as well as hue); roles are
#: also always named in text beside their colour.
ROLE_COLOURS = ("#1f5f8b", "#e0892b", "#67b3dc", "#9c4f8b", "#2f9576", "#d3be3c", "#6e4423",
                "#8a8a8a", "#2d2b6e", "#e6a3c3", "#4b4b4b", "#b8d6a0")
STATUS_COLOURS = {"changed": "#c2561c", "unsettled": "#d3be3c", "shifted": "#1f5f8b",
                  "steady": "#b9bec2"}
#: Most points a scatter chart draws; larger tables are sampled (seeded) and the chart says so.
MAX_POINTS = 3000


#: matplotlib settings for drift's charts, applied only inside ``rc_context`` while a chart is
#: drawn and saved, so a caller's own backend and style are never touched.
STYLE = {"svg.hashsalt": "drift", "font.size": 9, "axes.spines.top": False,
         "axes.spines.right": False, "svg.fonttype": "none",
         "text.parse_math": False}  # a "$" in a name is text, never math


def _styled(draw):
    """Run a chart function inside drift's local ``rc_context`` (never the global rcParams)."""
    import functools

    @functools.wraps(draw)
    def wrapper(*args, **kwargs):
        import matplotlib

        with matplotlib.rc_context(STYLE):
            return draw(*args, **kwargs)
    return wrapper


def _figure(width=7.0, height=3.2, ncols=1, nrows=1):
    # a bare Figure: no pyplot, so no backend is chosen and no global figure list is kept
    from matplotlib.figure import Figure

    fig = Figure(figsize=(width, height))
    return fig, fig.subplots(nrows, ncols, squeeze=False)


def _svg(fig) -> str:
    import io

    buf = io.StringIO()
    fig.tight_layout()
    fig.savefig(buf, format="svg", metadata={"Date": None, "Creator": None})
    text = buf.getvalue()
    text = text[text.index("<svg"):]
    # the RDF metadata block is boilerplate (no date is in it): drop it to keep the page small
    start, end = text.find("<metadata>"), text.find("</metadata>")
    return text[:start] + text[end + len("</metadata>"):] if start != -1 and end != -1 else text


def sample_rows(frame, limit=MAX_POINTS, seed=0):
    """At most ``limit`` rows of ``frame`` (a seeded sample in the original order)."""
    if len(frame) <= limit:
        return frame
    return frame.sample(n=limit, random_state=seed).sort_index()


def colour_of(role_ids):
    return {r: ROLE_COLOURS[i % len(ROLE_COLOURS)] for i, r in enumerate(role_ids)}


@_styled
def components_chart(diag) -> str:
    """Explained variance per component, cumulative share, and the parallel-analysis line."""
    fig, axes = _figure()
    ax = axes[0, 0]
    n = diag["n_components"].to_numpy()
    ax.bar(n, diag["eigenvalue"], color="#a9c8dd", label="eigenvalue")
    ax.plot(n, diag["random_eigenvalue_95"], color="#e0892b", lw=1.5,
            label="random data, 95th percentile (parallel analysis)")
    chosen = diag.loc[diag["chosen"], "n_components"]
    if len(chosen):
        ax.axvline(chosen.iloc[0] + 0.5, color="#333", ls="--", lw=1, label=f"kept: {chosen.iloc[0]}")
    ax.set_xlabel("component")
    ax.set_ylabel("eigenvalue")
    ax2 = ax.twinx()
    ax2.plot(n, diag["cumulative"], color="#1f5f8b", marker="o", ms=3, lw=1, label="cumulative share")
    ax2.set_ylim(0, 1.02)
    ax2.set_ylabel("cumulative share of variance")
    lines = ax.get_legend_handles_labels()
    lines2 = ax2.get_legend_handles_labels()
    ax.legend(lines[0] + lines2[0], lines[1] + lines2[1], frameon=False, fontsize=8, loc="center right")
    return _svg(fig)


@_styled
def roles_chart(diag) -> str:
    """Silhouette, Calinski-Harabasz, gap and stability against the number of roles."""
    fig, axes = _figure(width=7.5, height=4.2, ncols=2, nrows=2)
    panels = (("silhouette", "silhouette (higher is better)"),
              ("calinski_harabasz", "Calinski-Harabasz (higher is better)"),
              ("gap", "gap statistic (error bars: s_k)"),
              ("stability_min", "least stable role's bootstrap Jaccard"))
    chosen = diag.loc[diag["chosen"], "k"]
    for ax, (col, title) in zip(axes.ravel(), panels):
        if col == "gap":
            ax.errorbar(diag["k"], diag["gap"], yerr=diag["gap_se"], color="#1f5f8b", marker="o", ms=3)
        else:
            ax.plot(diag["k"], diag[col], color="#1f5f8b", marker="o", ms=3)
        if col == "stability_min":
            ax.axhline(STABLE_JACCARD, color="#e0892b", lw=1, ls=":")
        if len(chosen):
            ax.axvline(chosen.iloc[0], color="#333", ls="--", lw=1)
        ax.set_title(title, fontsize=9)
        ax.set_xlabel("roles (k)")
    return _svg(fig)


@_styled
def role_map_chart(placements, model, *, labels=("component 1", "component 2")) -> str:
    """The reference pool on the first two components, coloured by role, centres marked.

    ``labels`` name the axes (by the features that load on them). Above :data:`MAX_POINTS`
    player-seasons a seeded sample is drawn.
    """
    fig, axes = _figure(width=7.0, height=4.8)
    ax = axes[0, 0]
    colours = colour_of(model.role_ids_)
    if "pc2" not in placements.columns:
        placements = placements.assign(pc2=0.0)
    shown = sample_rows(placements)
    for rid, name in zip(model.role_ids_, model.role_names_):
        sel = shown["role"] == rid
        ax.scatter(shown.loc[sel, "pc1"], shown.loc[sel, "pc2"], s=6, alpha=0.45,
                   color=colours[rid], label=f"{rid} {name}", linewidths=0)
    for rid, c in zip(model.role_ids_, model.centroids_):
        y = c[1] if len(c) > 1 else 0.0
        ax.scatter([c[0]], [y], s=60, color=colours[rid], edgecolors="black", linewidths=0.8)
        ax.annotate(rid, (c[0], y), xytext=(4, 4), textcoords="offset points", fontsize=9, fontweight="bold")
    ax.set_xlabel(labels[0], fontsize=8)
    ax.set_ylabel(labels[1], fontsize=8)
    if len(shown) < len(placements):
        ax.set_title(f"a random {len(shown):,} of {len(placements):,} player-seasons", fontsize=8)
    ax.legend(frameon=False, fontsize=7, markerscale=2.5, loc="best")
    return _svg(fig)


@_styled
def drift_chart(drift, model, *, per_role=2) -> str:
    """Per role whose centre moved beyond noise, its features that did, with their noise bands.

    Values are the season centre minus the reference centre in pool SDs; the shaded band is
    the season centre's noise (``band_z`` standard errors, see :mod:`drift.measure.role_drift`). Returns
    "" when no role moved beyond noise.
    """
    import numpy as np

    from drift.measure.role_drift import band_z
    from drift.model.describe import feature_label

    moved = drift[drift["beyond_noise"]] if len(drift) else drift
    roles = [r for r in model.role_ids_ if len(moved) and (moved["role"] == r).any()]
    if not roles:
        return ""
    z = band_z(len(model.features_))
    sd = (drift["change"] / drift["change_sd"]).replace([np.inf, -np.inf], np.nan)
    ncols = 2
    nrows = int(np.ceil(len(roles) / ncols))
    fig, axes = _figure(width=7.5, height=2.1 * nrows, ncols=ncols, nrows=nrows)
    for ax in axes.ravel()[len(roles):]:
        ax.set_visible(False)
    names = dict(zip(model.role_ids_, model.role_names_))
    for ax, rid in zip(axes.ravel(), roles):
        block = drift[drift["role"] == rid]
        strength = moved[moved["role"] == rid].groupby("feature")["change_sd"].agg(lambda v: v.abs().max())
        for i, feat in enumerate(strength.sort_values(ascending=False).index[:per_role]):
            line = block[block["feature"] == feat].sort_values("season")
            band = z * line["change_se"] / sd[line.index]
            colour = ROLE_COLOURS[(2 * i) % len(ROLE_COLOURS)]
            x = np.arange(len(line))
            ax.fill_between(x, line["change_sd"] - band, line["change_sd"] + band, color=colour, alpha=0.18,
                            linewidth=0)
            ax.plot(x, line["change_sd"], marker="o", ms=3, lw=1.2, color=colour, label=feature_label(feat))
            ax.set_xticks(x, [str(s)[-5:] for s in line["season"]])
        ax.axhline(0, color="#999", lw=0.8)
        ax.set_title(f"{rid} {names[rid]}", fontsize=8)
        ax.set_ylabel("vs reference (pool SD)", fontsize=7)
        ax.tick_params(labelsize=7)
        ax.legend(frameon=False, fontsize=6)
    return _svg(fig)


@_styled
def moves_chart(moves, *, alpha=0.01) -> str:
    """Evidence of each move (z) against the smaller of its two samples, with the decision line.

    A move is beyond noise exactly when its p-value is below ``alpha``, that is when its z
    (the one-sided normal equivalent of p) is above ``norm.isf(alpha)``: the dashed line is the
    rule itself. Above :data:`MAX_POINTS` moves a seeded sample is drawn.
    """
    import numpy as np
    from scipy.stats import norm

    fig, axes = _figure(width=7.0, height=3.8)
    ax = axes[0, 0]
    shown = sample_rows(moves)
    sample = np.minimum(shown["minutes_from"], shown["minutes_to"]) if len(shown) else shown
    for status, colour in STATUS_COLOURS.items():
        sel = (shown["status"] == status).to_numpy() if len(shown) else np.zeros(0, bool)
        ax.scatter(np.asarray(sample)[sel], shown["z"].clip(lower=-1).to_numpy()[sel], s=7, alpha=0.65,
                   color=colour, label=f"{status} ({int((moves['status'] == status).sum()):,})", linewidths=0,
                   marker={"changed": "D", "unsettled": "s", "shifted": "^"}.get(status, "o"))
    line = float(norm.isf(alpha))
    ax.axhline(line, color="#222", ls="--", lw=1)
    ax.annotate(f"beyond noise above this line (p < {alpha:g}, z > {line:.2f})", (0.01, line),
                xycoords=("axes fraction", "data"), xytext=(0, 4), textcoords="offset points", fontsize=7)
    ax.set_yscale("symlog", linthresh=4)
    top = float(shown["z"].max()) if len(shown) else 10.0
    ticks = [t for t in (0, 2, 4, 10, 20, 50, 100, 200, 500) if t <= max(top, 4)]
    ax.set_yticks(ticks, [str(t) for t in ticks])  # plain numbers: chart text is never parsed as math
    ax.set_xlabel("minutes in the smaller of the two seasons")
    ax.set_ylabel("evidence of a move (z)")
    if len(shown) < len(moves):
        ax.set_title(f"a random {len(shown):,} of {len(moves):,} moves", fontsize=8)
    ax.legend(frameon=False, fontsize=7, loc="upper right")
    return _svg(fig)


@_styled
def reliability_chart(noise, weights) -> str:
    """Per feature: year-to-year correlation and the share of spread that is signal."""
    import numpy as np

    from drift.model.describe import feature_label

    labels = [feature_label(f) for f in noise.index]
    y = np.arange(len(labels))
    fig, axes = _figure(width=7.0, height=0.22 * len(labels) + 0.9)
    ax = axes[0, 0]
    ax.barh(y - 0.2, noise["year_to_year_r"].fillna(0).clip(lower=0), height=0.4, color="#1f5f8b",
            label="year-to-year correlation (returning players)")
    ax.barh(y + 0.2, noise["signal_share"], height=0.4, color="#e0892b",
            label="signal share at the median sample")
    ax.set_yticks(y, labels, fontsize=7)
    ax.invert_yaxis()
    ax.set_xlim(0, 1)
    ax.legend(frameon=False, fontsize=7, loc="lower right")
    return _svg(fig)
