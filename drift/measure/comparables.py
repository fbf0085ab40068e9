"""Comparables: the nearest reference player-seasons of other players, in component space.

The search is exact (scikit-learn's ``NearestNeighbors``, which picks a k-d tree,
a ball tree or brute force for the shape of the data). Its cost grows with the
rows searched times the pool, so a large league searches only the rows its
outputs need: every placement up to :data:`ALL_ROWS` placements; above that, the
seasons a move lands in when that move is not *steady* (changed, unsettled or
shifted: the players a reader looks up), which also covers every move the report
lists.
"""

from __future__ import annotations

__all__ = ["comparables", "needed_rows", "run_comparables", "ALL_ROWS"]

#: leagues up to this many placements get comparables for every placement
ALL_ROWS = 50_000


def comparables(model, placements, pool_placements, *, n=5, rows=None):
    """The ``n`` nearest pool player-seasons (other players only) of placements ``rows``.

    Parameters
    ----------
    model : RoleModel
    placements, pool_placements : DataFrame
        Placements (with ``pc1..pcq``) to find comparables for, and the pool to search.
    n : int
    rows : int array, optional
        Positions in ``placements`` to search for (default every row); the result
        for a row does not depend on which other rows are searched.

    Returns
    -------
    DataFrame: player_id, player, season, rank, comp_player_id, comp_player,
    comp_season, comp_team, comp_role, distance.
    """
    import numpy as np
    import pandas as pd
    from sklearn.neighbors import NearestNeighbors

    q = model.components_.shape[0]
    pcs = [f"pc{j + 1}" for j in range(q)]
    pool = pool_placements.reset_index(drop=True)
    query = placements.reset_index(drop=True)
    if rows is not None:
        query = query.iloc[np.asarray(rows, int)].reset_index(drop=True)
    extra = int(pool.groupby("player_id").size().max()) if len(pool) else 0
    k = min(n + extra, len(pool))
    nn = NearestNeighbors(n_neighbors=k).fit(pool[pcs].to_numpy())
    dist, idx = nn.kneighbors(query[pcs].to_numpy())
    pool_ids = pool["player_id"].to_numpy()
    own = query["player_id"].to_numpy()
    other = pool_ids[idx] != own[:, None]
    # first n neighbours that are other players: rank among the kept columns
    rank = np.cumsum(other, axis=1)
    take = other & (rank <= n)
    hit, cols = np.nonzero(take)
    j = idx[hit, cols]
    return pd.DataFrame({
        "player_id": own[hit], "player": query["player"].to_numpy()[hit],
        "season": query["season"].to_numpy()[hit], "rank": rank[hit, cols],
        "comp_player_id": pool_ids[j], "comp_player": pool["player"].to_numpy()[j],
        "comp_season": pool["season"].to_numpy()[j], "comp_team": pool["team"].to_numpy()[j],
        "comp_role": pool["role"].to_numpy()[j], "distance": dist[hit, cols],
    })


def needed_rows(placements, moves, *, all_rows=ALL_ROWS):
    """Positions of the placements whose comparables the outputs need (None: every row).

    Up to ``all_rows`` placements, every row. Above, the season each move that is
    not *steady* lands in (``player_id``, ``season_to``), in placement order.
    """
    import numpy as np
    import pandas as pd

    if len(placements) <= all_rows:
        return None
    if not len(moves):
        return np.zeros(0, int)
    moved = moves.loc[moves["status"] != "steady", ["player_id", "season_to"]].drop_duplicates()
    keys = pd.DataFrame({"player_id": placements["player_id"].to_numpy(),
                         "season_to": placements["season"].to_numpy(),
                         "position": np.arange(len(placements))})
    return np.sort(keys.merge(moved, on=["player_id", "season_to"])["position"].to_numpy())


def run_comparables(model, placements, moves, *, n=5, all_rows=ALL_ROWS):
    """Comparables of the rows the outputs need, searched in the reference seasons' placements."""
    pool_mask = placements["season"].isin(model.reference_seasons_).to_numpy()
    rows = needed_rows(placements, moves, all_rows=all_rows)
    return comparables(model, placements, placements[pool_mask], n=n, rows=rows)
