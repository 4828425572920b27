"""Parts that can replace a reference part, closest first, with the differences in words.

Every other part of the catalog gets one class:

``drop_in``
    same nominal frequency (exactly), mode, calibration and load capacitance, footprint and
    crystal pads, no taller, nothing worse that matters (with a brief: it is ``fit`` in the
    brief's circuit; without one: no data-sheet figure is worse than the reference's).
``drop_in_new_caps``
    as drop_in, but specified at another load capacitance: the load capacitors change (the
    new standard values are given).
``review``
    fits the footprint at the right frequency, but something needs an engineer: series
    instead of parallel calibration (the ppm it runs off is given), taller, a narrower
    temperature range, a lower drive rating, a missing qualification or a worse MSL, a pinout
    the catalog does not state, worse figures without a brief to judge them, or "marginal"
    in the brief's circuit.
``incompatible``
    another frequency (a near miss such as 32.000 kHz for 32.768 kHz is said explicitly with
    the ppm difference), mode, package or crystal pads, or ruled out in the brief's circuit.

Classification is vectorised over the whole catalog; the sentences are written only for the
rows somebody reads (:meth:`AlternatesResult.rows` builds them on first use, ``top(n)`` for
just the first ``n``).
"""

from __future__ import annotations

import math
from dataclasses import dataclass, field
from functools import cached_property
from typing import Literal

import numpy as np
import pandas as pd

from picker.brief import Board, Brief
from picker.physics import capacitors, crystal
from picker.rank import STATUSES, Ranking, order_rows, reasons_for_row
from picker.session import RankSession

Fit = Literal["drop_in", "drop_in_new_caps", "review", "incompatible"]
FITS: tuple[Fit, ...] = ("drop_in", "drop_in_new_caps", "review", "incompatible")

#: A different frequency within this fraction of the reference's is called a near miss.
NEAR_MISS_FRACTION = 0.05
#: Relative frequency difference below which two nominal frequencies are the same.
SAME_FREQUENCY = 1e-9
#: Pin capacitance assumed for cap advice without a brief [F] (the brief's default).
DEFAULT_PIN_F = 1.5e-12


@dataclass(frozen=True)
class Alternate:
    """One candidate part compared with the reference.

    Attributes
    ----------
    mpn : its part number.
    fit : drop_in, drop_in_new_caps, review or incompatible.
    differences : what differs, in words, the deciding ones first.
    new_caps_f : the load capacitors (Ca, Cb) it needs [F] when they change, else None.
    position : row position in the part table (and in ``AlternatesResult.ranking``).
    """

    mpn: str
    fit: Fit
    differences: tuple[str, ...]
    new_caps_f: tuple[float, float] | None
    position: int


@dataclass(frozen=True)
class AlternatesResult:
    """Every other part, classified and ordered closest first.

    Attributes
    ----------
    reference_mpn : the reference part number.
    parts : the part table searched.
    brief : the circuit the comparison used, or None (data-sheet comparison only).
    ranking : the brief's ranking of all parts (None without a brief).
    fit_codes : class index into FITS per part position (-1 for the reference itself).
    closeness : within a class, higher is closer (fewer worse figures, then the brief's
        score), per part position.
    order : positions of the other parts, closest first (sorted on first use: breaking ties
        by part number over a million rows takes seconds, so ``top(n)`` sorts only the
        rows that can reach the first ``n`` places).
    """

    reference_mpn: str
    parts: pd.DataFrame
    brief: Brief | None
    ranking: Ranking | None
    fit_codes: np.ndarray
    closeness: np.ndarray
    _reference_position: int = field(repr=False, default=0)

    @property
    def size(self) -> int:
        """How many other parts were compared."""
        return int(np.count_nonzero(self.fit_codes >= 0))

    @cached_property
    def order(self) -> np.ndarray:
        return self._ordered(None)

    def _ordered(self, n: int | None) -> np.ndarray:
        others = np.flatnonzero(self.fit_codes >= 0)
        if n is not None and n < others.size:
            # Only rows whose key is within the n best can be among the first n.
            key = self.fit_codes[others] * 1000.0 - self.closeness[others]
            kth = np.partition(key, n - 1)[n - 1]
            others = others[key <= kth]
        ranked = order_rows(
            self.fit_codes[others], self.closeness[others], self.parts["mpn"].iloc[others]
        )
        chosen = others[ranked]
        return chosen if n is None else chosen[:n]

    @property
    def reference(self) -> pd.Series:
        return self.parts.iloc[self._reference_position]

    def counts(self) -> dict[str, int]:
        return {name: int(np.count_nonzero(self.fit_codes == i)) for i, name in enumerate(FITS)}

    def top(self, n: int | None = None) -> list[Alternate]:
        """The closest ``n`` alternates (all when None), differences written out."""
        if n is None or "order" in self.__dict__:
            positions = self.order if n is None else self.order[:n]
        else:
            positions = self._ordered(n)
        return [self._alternate(int(p)) for p in positions]

    @cached_property
    def rows(self) -> list[Alternate]:
        """Every other part, closest first (writes sentences for all of them: use top(n) on
        very large catalogs)."""
        return self.top(None)

    def analysis_row(self, position: int) -> pd.Series | None:
        """The brief's ranked analysis row for a part position, or None without a brief."""
        if self.ranking is None:
            return None
        return self.ranking.analysis.iloc[position]

    def _alternate(self, position: int) -> Alternate:
        part = self.parts.iloc[position]
        fit = FITS[int(self.fit_codes[position])]
        words, caps = describe_differences(
            self.reference, part, self.brief, self.analysis_row(position),
            self.analysis_row(self._reference_position),
        )  # fmt: skip
        return Alternate(
            mpn=str(part["mpn"]),
            fit=fit,
            differences=tuple(words),
            new_caps_f=caps,
            position=position,
        )


def find_alternates(
    parts: pd.DataFrame,
    reference_mpn: str,
    brief: Brief | None,
    *,
    session: RankSession | None = None,
) -> AlternatesResult:
    """Classify every other part of ``parts`` as an alternate for ``reference_mpn``.

    Parameters
    ----------
    parts : the part table.
    reference_mpn : exact part number of the reference (resolve typing with
        :func:`picker.match.match_part_number` first).
    brief : the circuit; with it every alternate's circuit figures are computed (as for
        ``analyze``) and its status in that circuit decides; without it the data sheets are
        compared.
    session : the caller's :class:`picker.session.RankSession` of ``parts`` (the one its
        shortlist came from), so the brief's ranking is reused rather than recomputed.

    Raises
    ------
    KeyError
        When ``reference_mpn`` is not in ``parts``.
    """
    hits = np.flatnonzero((parts["mpn"] == reference_mpn).to_numpy(dtype=bool))
    if hits.size == 0:
        raise KeyError(reference_mpn)
    ref_pos = int(hits[0])
    if session is not None and session.parts is not parts:
        raise ValueError("find_alternates: the session ranks another part table")
    ranking = None
    if brief is not None:
        # Circuit figures only for the parts at the brief's frequency (the session's first
        # stage); every other part is incompatible or ruled out on catalog columns alone.
        ranking = (session or RankSession(parts)).rank(brief)
    codes, worse = classify(parts, ref_pos, ranking)
    codes[ref_pos] = -1
    # Closest first: class, then how many figures are worse, then (with a brief) the score,
    # then the part number.
    score = (
        ranking.analysis["score"].to_numpy(dtype=float)
        if ranking is not None
        else np.zeros(len(parts))
    )
    closeness = score - np.minimum(worse, 10) * 1.5
    return AlternatesResult(
        reference_mpn=reference_mpn,
        parts=parts,
        brief=brief,
        ranking=ranking,
        fit_codes=codes,
        closeness=closeness,
        _reference_position=ref_pos,
    )


def _num(parts: pd.DataFrame, name: str) -> np.ndarray:
    if name not in parts.columns:
        return np.full(len(parts), np.nan)
    return parts[name].to_numpy(dtype=float, na_value=np.nan)


def _codes(parts: pd.DataFrame, name: str) -> tuple[np.ndarray, list[str]]:
    """Integer codes and their labels for a text column ("" for missing), cheaply: catalog
    text columns are categoricals; anything else is factorised once."""
    n = len(parts)
    if name not in parts.columns:
        return np.zeros(n, dtype=np.int64), [""]
    column = parts[name]
    if isinstance(column.dtype, pd.CategoricalDtype):
        codes = column.cat.codes.to_numpy().astype(np.int64)
        uniques = list(column.cat.categories)
    else:
        codes, found = pd.factorize(column, sort=False)
        uniques = list(found)
    labels = [_s(u) for u in uniques] + [""]
    return np.where(codes < 0, len(labels) - 1, codes), labels


def _txt_same(parts: pd.DataFrame, name: str, ref_pos: int) -> np.ndarray:
    """True where the column's text equals the reference's (missing equals missing)."""
    codes, labels = _codes(parts, name)
    same_label = np.asarray([label == labels[codes[ref_pos]] for label in labels], dtype=bool)
    return same_label[codes]


def _txt_blank(parts: pd.DataFrame, name: str) -> np.ndarray:
    codes, labels = _codes(parts, name)
    return np.asarray([label == "" for label in labels], dtype=bool)[codes]


def classify(
    parts: pd.DataFrame, ref_pos: int, ranking: Ranking | None
) -> tuple[np.ndarray, np.ndarray]:
    """Class index (into FITS) and a count of worse figures, per part (vectorised)."""
    n = len(parts)
    freq = _num(parts, "freq_hz")
    f_ref = freq[ref_pos]
    incompatible = ~(np.abs(freq - f_ref) <= SAME_FREQUENCY * f_ref)
    for name in ("mode", "package"):
        incompatible |= ~_txt_same(parts, name, ref_pos)
    blank_pinout = _txt_blank(parts, "pinout")
    same_pinout = _txt_same(parts, "pinout", ref_pos)
    incompatible |= ~blank_pinout & ~blank_pinout[ref_pos] & ~same_pinout
    review = np.zeros(n, dtype=bool)
    review |= blank_pinout != blank_pinout[ref_pos]

    series = _series(parts)
    review |= series != series[ref_pos]
    cl = _num(parts, "load_capacitance_f")
    new_caps = ~series & ~series[ref_pos] & ~(np.abs(cl - cl[ref_pos]) <= 1e-15)

    height = _num(parts, "height_mm")
    review |= height > height[ref_pos] + 1e-9
    t_min, t_max = _num(parts, "temp_min_c"), _num(parts, "temp_max_c")
    narrower = (t_min > t_min[ref_pos]) | (t_max < t_max[ref_pos])
    if not _txt_blank(parts, "qualification")[ref_pos]:
        review |= ~_txt_same(parts, "qualification", ref_pos)
    msl = _num_text(parts, "msl")
    if np.isfinite(msl[ref_pos]):
        review |= ~(msl <= msl[ref_pos])

    worse = np.zeros(n, dtype=np.int64)
    for name in ("tolerance_ppm", "stability_ppm", "esr_ohm", "aging_ppm"):
        values = _num(parts, name)
        worse += values > values[ref_pos] * (1 + 1e-9)
    drive_rating = _num(parts, "drive_level_w")
    worse += drive_rating < drive_rating[ref_pos] * (1 - 1e-9)
    worse += narrower

    if ranking is None:
        # Without a circuit, any worse data-sheet figure needs an engineer's judgement, and
        # an obsolete part is no replacement to buy (a brief's lifecycle rule rules it out).
        review |= (worse > 0) | narrower
        codes_lc, labels_lc = _codes(parts, "lifecycle")
        review |= np.asarray([label == "obsolete" for label in labels_lc], dtype=bool)[codes_lc]
    else:
        # In the brief's circuit: a rule the reference passes but the alternate fails makes it
        # incompatible; marginal where the reference is fit needs a review. (Failures the
        # reference shares are the circuit's, not the alternate's; the header says so.)
        fail = ranking.analysis["fail_mask"].to_numpy(dtype=np.int64)
        # Status codes index rank.STATUSES (fit, marginal, ruled_out): comparing codes, not
        # a million status strings.
        status = ranking.analysis["status"].cat.codes.to_numpy()
        fit_code, marginal_code = STATUSES.index("fit"), STATUSES.index("marginal")
        incompatible |= (fail & ~fail[ref_pos]) != 0
        review |= (status == marginal_code) & (status[ref_pos] == fit_code)
    codes = np.where(incompatible, 3, np.where(review, 2, np.where(new_caps, 1, 0))).astype(
        np.int64
    )
    return codes, worse


def _series(parts: pd.DataFrame) -> np.ndarray:
    if "series_calibrated" in parts.columns:
        return parts["series_calibrated"].to_numpy(dtype=bool)
    return np.isnan(_num(parts, "load_capacitance_f"))


def _num_text(parts: pd.DataFrame, name: str) -> np.ndarray:
    """A text column of numbers (MSL "3") as floats; NaN where not a number."""
    codes, labels = _codes(parts, name)
    values = pd.to_numeric(pd.Series(labels, dtype=object), errors="coerce")
    return values.to_numpy(dtype=float)[codes]


# --------------------------------------------------------------------------- words


def _f(value: object) -> float:
    try:
        return float(value)  # type: ignore[arg-type]
    except (TypeError, ValueError):
        return float("nan")


def _s(value: object) -> str:
    text = "" if value is None else str(value)
    return "" if text in ("nan", "<NA>", "None") else text


def _g(value: float, digits: int = 3) -> str:
    return "n/a" if not np.isfinite(value) else f"{value:.{digits}g}"


def _t(celsius: float) -> str:
    return _g(celsius).replace("-", "−")


def _freq_text(hz: float) -> str:
    if hz >= 1e6:
        return f"{hz / 1e6:.6f}".rstrip("0").rstrip(".") + " MHz"
    return f"{hz / 1e3:.3f} kHz"


def _ohm(value: float) -> str:
    return f"{_g(value / 1e3)} kΩ" if abs(value) >= 1e3 else f"{_g(value)} Ω"


def _pf(value: float) -> str:
    return f"{_g(value * 1e12)} pF"


def describe_differences(
    ref: pd.Series,
    alt: pd.Series,
    brief: Brief | None,
    alt_analysis: pd.Series | None,
    ref_analysis: pd.Series | None,
) -> tuple[list[str], tuple[float, float] | None]:
    """Sentences for how ``alt`` differs from ``ref`` (deciding ones first) and new caps."""
    words: list[str] = []
    new_caps: tuple[float, float] | None = None
    f_ref, f_alt = _f(ref["freq_hz"]), _f(alt["freq_hz"])
    if not abs(f_alt - f_ref) <= SAME_FREQUENCY * f_ref:
        ppm = (f_alt - f_ref) / f_ref * 1e6
        text = f"frequency {_freq_text(f_alt)} vs {_freq_text(f_ref)} ({ppm:+,.0f} ppm)"
        if abs(f_alt - f_ref) <= NEAR_MISS_FRACTION * f_ref:
            text = (
                f"near miss: {_freq_text(f_alt)} is NOT {_freq_text(f_ref)} "
                f"({ppm:+,.1f} ppm); not interchangeable"
            )
        words.append(text)
    for name, label in (("mode", "mode"), ("package", "footprint")):
        if _s(alt.get(name)) != _s(ref.get(name)):
            words.append(f"{label} {_s(alt.get(name)) or '?'} vs {_s(ref.get(name)) or '?'}")
    p_ref, p_alt = _s(ref.get("pinout")), _s(alt.get("pinout"))
    if p_ref and p_alt and p_ref != p_alt:
        words.append(f"crystal pads {p_alt} vs {p_ref}: a different pinout on the same footprint")
    elif bool(p_ref) != bool(p_alt):
        words.append(
            f"crystal pads {p_alt or 'not stated'} vs {p_ref or 'not stated'}: check the pinout"
        )
    if alt_analysis is not None and brief is not None and str(alt_analysis["status"]) != "fit":
        reasons = reasons_for_row(alt_analysis, brief)
        if reasons:
            status = str(alt_analysis["status"]).replace("_", " ")
            words.append(f"{status} in this circuit: {reasons[0]}")
    series_ref, series_alt = bool(ref.get("series_calibrated")), bool(alt.get("series_calibrated"))
    cl_ref, cl_alt = _f(ref["load_capacitance_f"]), _f(alt["load_capacitance_f"])
    if series_alt and not series_ref:
        off = _series_offset_ppm(alt, cl_ref, alt_analysis)
        words.append(
            f"series-calibrated (the reference is specified at {_pf(cl_ref)}): in this "
            f"parallel circuit it runs about {off:+.0f} ppm off its nominal"
        )
    elif series_ref and not series_alt:
        words.append(
            f"calibrated at {_pf(cl_alt)} load (the reference at series resonance): the "
            "oscillator circuit must provide that load"
        )
    elif not series_ref and not abs(cl_alt - cl_ref) <= 1e-15:
        new_caps, text = _new_caps_text(ref, alt, brief, alt_analysis, ref_analysis)
        words.append(text)
    words.extend(_spec_notes(ref, alt, brief, alt_analysis, ref_analysis))
    return words, new_caps


def _series_offset_ppm(alt: pd.Series, cl_ref: float, analysis: pd.Series | None) -> float:
    """How far a series-calibrated part runs from its nominal in the reference's circuit:
    the brief's pulling figure, or the load-resonance offset at the reference's CL."""
    if analysis is not None and np.isfinite(_f(analysis["pulling_ppm"])):
        return _f(analysis["pulling_ppm"])
    c0, c1 = _f(alt.get("c0_f")), _f(alt.get("c1_f"))
    if not (np.isfinite(c0) and np.isfinite(c1)):
        from picker.physics import estimates

        est = estimates.estimate_motional_capacitances(
            _f(alt["freq_hz"]), _s(alt.get("package")), _s(alt.get("mode")) or "fundamental",
            _s(alt.get("cut")), c0, c1, _f(alt.get("l1_h")),
        )  # fmt: skip
        c0, c1 = float(est.c0_f), float(est.c1_f)
    return float(crystal.load_resonance_offset(c1, c0, cl_ref)) * 1e6


def _new_caps_text(
    ref: pd.Series,
    alt: pd.Series,
    brief: Brief | None,
    alt_analysis: pd.Series | None,
    ref_analysis: pd.Series | None,
) -> tuple[tuple[float, float] | None, str]:
    cl_ref, cl_alt = _f(ref["load_capacitance_f"]), _f(alt["load_capacitance_f"])
    head = f"load capacitance {_pf(cl_alt)} vs {_pf(cl_ref)}"
    if alt_analysis is not None and ref_analysis is not None:
        source = str(alt_analysis["caps_source"])
        if source == "internal":
            code = _s(alt_analysis["internal_cap_code"])
            internal = brief.amplifier.internal_caps if brief is not None else None
            per_pin = internal is None or internal.applies_to == "each_pin"
            where = " (each pin)" if per_pin else " (load)"
            return None, f"{head}: change the chip's load-capacitor setting to {code}{where}"
        if source == "fixed":
            pulling = _f(alt_analysis["pulling_ppm"])
            return None, f"{head}: with the brief's fixed caps it is pulled {pulling:+.1f} ppm"
        new = (_f(alt_analysis["cap_a_f"]), _f(alt_analysis["cap_b_f"]))
        old = (_f(ref_analysis["cap_a_f"]), _f(ref_analysis["cap_b_f"]))
        assumption = ""
    else:
        board, pin = Board(), DEFAULT_PIN_F
        pair_new = capacitors.choose_unequal_pair(cl_alt, board.stray_capacitance_f, pin)
        pair_old = capacitors.choose_unequal_pair(cl_ref, board.stray_capacitance_f, pin)
        new = (float(pair_new.cap_a_f), float(pair_new.cap_b_f))
        old = (float(pair_old.cap_a_f), float(pair_old.cap_b_f))
        assumption = (
            f" (assuming {_pf(board.stray_capacitance_f)} stray and {_pf(pin)} per pin; give a "
            "brief for your board)"
        )
    return new, f"{head}: change both caps from {_pair(old)} to {_pair(new)}{assumption}"


def _pair(caps: tuple[float, float]) -> str:
    a, b = caps
    if abs(a - b) <= 1e-16:
        return _pf(a)
    return f"{_pf(a)} + {_pf(b)}"


def _spec_notes(
    ref: pd.Series,
    alt: pd.Series,
    brief: Brief | None,
    alt_analysis: pd.Series | None,
    ref_analysis: pd.Series | None,
) -> list[str]:
    notes: list[str] = []
    h_ref, h_alt = _f(ref.get("height_mm")), _f(alt.get("height_mm"))
    if h_alt > h_ref + 1e-9:
        notes.append(f"height {_g(h_alt)} mm vs {_g(h_ref)} mm: taller, check the enclosure")
    lo_r, hi_r = _f(ref.get("temp_min_c")), _f(ref.get("temp_max_c"))
    lo_a, hi_a = _f(alt.get("temp_min_c")), _f(alt.get("temp_max_c"))
    if lo_a > lo_r or hi_a < hi_r:
        notes.append(f"rated {_t(lo_a)}…{_t(hi_a)} °C vs {_t(lo_r)}…{_t(hi_r)} °C: narrower range")
    d_ref, d_alt = _f(ref.get("drive_level_w")), _f(alt.get("drive_level_w"))
    if alt_analysis is not None:
        level = _f(alt_analysis["drive_level_w"])
        rating = _f(alt_analysis["drive_rating_w"])
        if level > rating:
            notes.append(
                f"drive rating {_g(rating * 1e6)} µW is below this circuit's "
                f"{_g(level * 1e6)} µW: over-driven"
            )
    if d_alt < d_ref:
        notes.append(f"drive rating {_g(d_alt * 1e6)} µW vs {_g(d_ref * 1e6)} µW: lower")
    q_ref, q_alt = _s(ref.get("qualification")), _s(alt.get("qualification"))
    if q_ref and q_alt != q_ref:
        notes.append(f"qualification {q_alt or 'none'} vs {q_ref}")
    m_ref, m_alt = _s(ref.get("msl")), _s(alt.get("msl"))
    if m_ref and m_alt != m_ref:
        notes.append(f"MSL {m_alt or 'not stated'} vs {m_ref}")
    esr_r, esr_a = _f(ref.get("esr_ohm")), _f(alt.get("esr_ohm"))
    if abs(esr_a - esr_r) > 1e-9:
        text = f"ESR {_ohm(esr_a)} vs {_ohm(esr_r)}: {'worse' if esr_a > esr_r else 'better'}"
        m_a = _f(alt_analysis["form_margin"]) if alt_analysis is not None else math.nan
        if ref_analysis is not None and alt_analysis is not None and np.isfinite(m_a):
            m_r = _f(ref_analysis["form_margin"])
            label = "margin" if str(alt_analysis["amplifier_form"]) != "gm_crit_max" else "gain"
            text = f"ESR {_ohm(esr_a)} vs {_ohm(esr_r)}: {label} {_g(m_a, 2)} instead of " + (
                f"{_g(m_r, 2)} in this circuit"
            )
        notes.append(text)
    for name, label in (
        ("tolerance_ppm", "tolerance"),
        ("stability_ppm", "stability"),
        ("aging_ppm", "aging"),
    ):
        r, a = _f(ref.get(name)), _f(alt.get(name))
        if np.isfinite(r) and np.isfinite(a) and abs(a - r) > 1e-9:
            notes.append(f"{label} ±{_g(a)} ppm vs ±{_g(r)} ppm: {'worse' if a > r else 'better'}")
    if alt_analysis is not None and ref_analysis is not None:
        t_a, t_r = _f(alt_analysis["error_total_ppm"]), _f(ref_analysis["error_total_ppm"])
        if abs(t_a - t_r) > 0.05:
            notes.append(f"total error {_g(t_a)} ppm vs {_g(t_r)} ppm in this circuit")
    lc = _s(alt.get("lifecycle"))
    if lc == "obsolete":
        notes.insert(0, "lifecycle obsolete: not for new purchases")
    elif lc and lc != "active":
        notes.append(f"lifecycle {lc}")
    return notes
