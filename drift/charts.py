"""Charts for the report, rendered by matplotlib to inline SVG strings.

Each function takes tidy tables and returns an ``<svg>`` string; output is
deterministic (fixed hash salt, no date metadata) so a re-run gives the same bytes.
"""

from __future__ import annotations

__all__ = ["components_chart", "roles_chart", "role_map_chart", "drift_chart", "moves_chart",
           "reliability_chart", "ROLE_COLOURS"]

#: drift's own role palette: muted, distinguishable, readable on white
ROLE_COLOURS = ("#2f6b9a", "#c0622f", "#4f8a3c", "#8e4c8f", "#b59a2a", "#3f8f8a", "#a8435a",
                "#6b6b6b", "#7a5c3e", "#5566b0", "#8aa53a", "#c4587f")
_STATUS_COLOURS = {"changed": "#a8435a", "unsettled": "#b59a2a", "shifted": "#2f6b9a",
                   "steady": "#b8b8b8"}


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
    return text[text.index("<svg"):]


def colour_of(role_ids):
    return {r: ROLE_COLOURS[i % len(ROLE_COLOURS)] for i, r in enumerate(role_ids)}


@_styled
def components_chart(diag) -> str:
    """Explained variance per component, cumulative share, and the parallel-analysis line."""
    fig, axes = _figure()
    ax = axes[0, 0]
    n = diag["n_components"].to_numpy()
    ax.bar(n, diag["eigenvalue"], color="#9fb7cc", label="eigenvalue")
    ax.plot(n, diag["random_eigenvalue_95"], color="#c0622f", lw=1.5,
            label="random data, 95th percentile (parallel analysis)")
    chosen = diag.loc[diag["chosen"], "n_components"]
    if len(chosen):
        ax.axvline(chosen.iloc[0] + 0.5, color="#333", ls="--", lw=1, label=f"kept: {chosen.iloc[0]}")
    ax.set_xlabel("component")
    ax.set_ylabel("eigenvalue")
    ax2 = ax.twinx()
    ax2.plot(n, diag["cumulative"], color="#2f6b9a", marker="o", ms=3, lw=1, label="cumulative share")
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
            ax.errorbar(diag["k"], diag["gap"], yerr=diag["gap_se"], color="#2f6b9a", marker="o", ms=3)
        else:
            ax.plot(diag["k"], diag[col], color="#2f6b9a", marker="o", ms=3)
        if col == "stability_min":
            ax.axhline(0.6, color="#c0622f", lw=1, ls=":")
        if len(chosen):
            ax.axvline(chosen.iloc[0], color="#333", ls="--", lw=1)
        ax.set_title(title, fontsize=9)
        ax.set_xlabel("roles (k)")
    return _svg(fig)


@_styled
def role_map_chart(placements, model) -> str:
    """The reference pool on the first two components, coloured by role, centroids marked."""
    fig, axes = _figure(width=7.0, height=4.6)
    ax = axes[0, 0]
    colours = colour_of(model.role_ids_)
    if "pc2" not in placements.columns:
        placements = placements.assign(pc2=0.0)
    for rid, name in zip(model.role_ids_, model.role_names_):
        sel = placements["role"] == rid
        ax.scatter(placements.loc[sel, "pc1"], placements.loc[sel, "pc2"], s=6, alpha=0.45,
                   color=colours[rid], label=f"{rid} {name}", linewidths=0)
    cent = model.centroids_
    for rid, c in zip(model.role_ids_, cent):
        y = c[1] if len(c) > 1 else 0.0
        ax.scatter([c[0]], [y], s=60, color=colours[rid], edgecolors="black", linewidths=0.8)
        ax.annotate(rid, (c[0], y), xytext=(4, 4), textcoords="offset points", fontsize=9,
                    fontweight="bold")
    ax.set_xlabel("component 1")
    ax.set_ylabel("component 2")
    ax.legend(frameon=False, fontsize=7, markerscale=2.5, loc="best")
    return _svg(fig)


@_styled
def drift_chart(drift, model, *, per_role=2) -> str:
    """Per role, the features whose centroid moved most across seasons (in pool SDs)."""
    import numpy as np

    k = len(model.role_ids_)
    ncols = 2
    nrows = max(int(np.ceil(k / ncols)), 1)
    fig, axes = _figure(width=7.5, height=1.9 * nrows, ncols=ncols, nrows=nrows)
    for ax in axes.ravel()[k:]:
        ax.set_visible(False)
    for ax, rid, name in zip(axes.ravel(), model.role_ids_, model.role_names_):
        block = drift[drift["role"] == rid]
        if block.empty:
            ax.set_title(f"{rid} {name}: not found in single seasons", fontsize=8)
            continue
        spread = block.groupby("feature")["change_sd"].agg(lambda v: v.max() - v.min())
        for feat in spread.sort_values(ascending=False).index[:per_role]:
            line = block[block["feature"] == feat].sort_values("season")
            ax.plot(line["season"], line["change_sd"], marker="o", ms=3, lw=1.2, label=feat)
        ax.axhline(0, color="#999", lw=0.8)
        ax.set_title(f"{rid} {name}", fontsize=8)
        ax.set_ylabel("vs reference (SD)", fontsize=7)
        ax.tick_params(labelsize=7)
        ax.legend(frameon=False, fontsize=6)
    return _svg(fig)


@_styled
def moves_chart(moves) -> str:
    """Distance moved against the distance expected from noise, coloured by status."""
    fig, axes = _figure(width=7.0, height=3.6)
    ax = axes[0, 0]
    for status, colour in _STATUS_COLOURS.items():
        sel = moves["status"] == status
        ax.scatter(moves.loc[sel, "noise_distance"], moves.loc[sel, "distance"], s=7, alpha=0.6,
                   color=colour, label=f"{status} ({int(sel.sum())})", linewidths=0)
    top = float(max(moves["distance"].max(), moves["noise_distance"].max(), 1.0)) if len(moves) else 1.0
    ax.plot([0, top], [0, top], color="#666", lw=0.8, ls=":")
    ax.set_xlabel("distance expected from noise alone (RMS)")
    ax.set_ylabel("distance moved")
    ax.legend(frameon=False, fontsize=8)
    return _svg(fig)


@_styled
def reliability_chart(noise, weights) -> str:
    """Per feature: year-to-year correlation and the share of spread that is signal."""
    import numpy as np

    from .describe import feature_label

    labels = [feature_label(f) for f in noise.index]
    y = np.arange(len(labels))
    fig, axes = _figure(width=7.0, height=0.22 * len(labels) + 0.9)
    ax = axes[0, 0]
    ax.barh(y - 0.2, noise["year_to_year_r"].fillna(0).clip(lower=0), height=0.4, color="#2f6b9a",
            label="year-to-year correlation (returning players)")
    ax.barh(y + 0.2, noise["signal_share"], height=0.4, color="#c0622f",
            label="signal share at the median sample")
    ax.set_yticks(y, labels, fontsize=7)
    ax.invert_yaxis()
    ax.set_xlim(0, 1)
    ax.legend(frameon=False, fontsize=7, loc="lower right")
    return _svg(fig)
