"""The one fuzzy part-number lookup used by the command line and the terminal UI.

A typed part number is resolved in three steps, cheapest first, so a catalog of a million
part numbers answers in well under a second:

1. exact text (after stripping surrounding spaces) -> used;
2. exact after rapidfuzz's ``default_process`` normalisation (case, punctuation, spaces:
   ``"abc-123 "`` finds ``"ABC123"`` only if the processed forms agree) when that is unique;
3. fuzzy: ``rapidfuzz.process.cdist`` (fuzz.ratio) with a score cutoff; one clear winner is
   used (the caller tells the user which part was taken), otherwise the closest candidates
   are returned so the caller can list them.
"""

from __future__ import annotations

from collections.abc import Iterable, Sequence
from dataclasses import dataclass
from typing import Literal

import numpy as np
import pandas as pd
from rapidfuzz import fuzz, process
from rapidfuzz.utils import default_process

MatchKind = Literal["exact", "normalised", "fuzzy", "none"]

#: Fuzzy scores (0..100, rapidfuzz ratio on processed text) below this are not candidates at all.
CANDIDATE_CUTOFF = 60.0
#: A fuzzy winner is "clear" when it scores at least this ...
CLEAR_SCORE = 85.0
#: ... and beats the runner-up by at least this many points.
CLEAR_LEAD = 5.0


@dataclass(frozen=True)
class MatchResult:
    """Outcome of a part-number lookup.

    Attributes
    ----------
    query : the text the user typed.
    mpn : the part number to use, or None when there is no single clear match.
    kind : "exact", "normalised" (equal after case/punctuation folding), "fuzzy" (one clear
        fuzzy winner; tell the user) or "none".
    candidates : closest part numbers with their scores (0..100), best first; empty for exact.
    """

    query: str
    mpn: str | None
    kind: MatchKind
    candidates: tuple[tuple[str, float], ...] = ()

    @property
    def found(self) -> bool:
        return self.mpn is not None

    def describe(self) -> str:
        """One line for stderr: what was used, or what came closest."""
        if self.kind == "exact" and self.mpn is not None:
            return f"using {self.mpn}"
        if self.mpn is not None:
            return f"no part number '{self.query}'; using the closest match {self.mpn}"
        if not self.candidates:
            return f"no part number resembles '{self.query}'"
        names = ", ".join(name for name, _ in self.candidates)
        return f"no part number '{self.query}'; closest: {names}"


def match_part_number(mpns: Iterable[str], text: str, *, limit: int = 5) -> MatchResult:
    """Resolve ``text`` to one of ``mpns`` (exact, normalised-exact, then one clear fuzzy match).

    Parameters
    ----------
    mpns : the catalog's part numbers (a Series, array or list of str).
    text : what the user typed.
    limit : how many candidates to return when no single match is clear.
    """
    query = text.strip()
    series = mpns if isinstance(mpns, pd.Series) else pd.Series(list(mpns), dtype=object)
    if series.empty or not query:
        return MatchResult(query=text, mpn=None, kind="none")
    # A vectorised comparison costs milliseconds at a million rows; the fuzzy pass costs more.
    hits = np.flatnonzero((series == query).to_numpy(dtype=bool, na_value=False))
    if hits.size:
        return MatchResult(query=text, mpn=str(series.iloc[hits[0]]), kind="exact")
    names = [str(name) for name in series.tolist()]
    folded = default_process(query)
    # fuzz.ratio (normalised edit distance) suits part numbers, where a typo is one character;
    # cdist spreads the million comparisons over all cores.
    scores = process.cdist(
        [folded],
        names,
        scorer=fuzz.ratio,
        processor=default_process,
        dtype=np.uint8,
        workers=-1,
        score_cutoff=CANDIDATE_CUTOFF,
    )[0]
    order = np.argsort(-scores.astype(np.int16), kind="stable")[: max(limit, 2) + 8]
    order = order[scores[order] > 0]
    perfect = [names[i] for i in order if scores[i] == 100]
    if len(perfect) == 1:
        return MatchResult(query=text, mpn=perfect[0], kind="normalised")
    candidates = tuple((names[i], float(scores[i])) for i in order[:limit])
    if len(perfect) > 1:
        return MatchResult(query=text, mpn=None, kind="none", candidates=candidates)
    if candidates and _is_clear(candidates):
        return MatchResult(query=text, mpn=candidates[0][0], kind="fuzzy", candidates=candidates)
    return MatchResult(query=text, mpn=None, kind="none", candidates=candidates)


def _is_clear(candidates: Sequence[tuple[str, float]]) -> bool:
    best = candidates[0][1]
    runner_up = candidates[1][1] if len(candidates) > 1 else 0.0
    return best >= CLEAR_SCORE and best - runner_up >= CLEAR_LEAD
