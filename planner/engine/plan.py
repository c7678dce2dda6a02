"""The whole plan: predicted lines ranked by expected signal, blends flagged, a scan that fits the slot.

:func:`make_plan` predicts the chosen species in the window, turns each line's
intensity into an expected signal and a time to the wanted SNR with a
sensitivity model (measurement.py), flags lines that another line would blend
with, and lets the optimiser of scanplan.py choose which settings to observe
and for how long.  Every line that is not scheduled says why.

Value of a plan: each detected target is worth its expected signal divided by
that of the strongest target (``make_plan(..., value_rule="signal")``, the default: the
strongest line is worth 1, weak lines little) or 1 (``value_rule="count"``:
as many lines as possible, as for a fit of constants).

References
----------
[1] J. J. Olivero and R. L. Longbothum, J. Quant. Spectrosc. Radiat. Transfer 17,
    233 (1977) (Voigt full width, see measurement.voigt_fwhm).
"""

from __future__ import annotations

import math
from dataclasses import dataclass, field

import numpy as np

from .linelist import LineTable, Prediction
from .measurement import time_to_snr_s, voigt_fwhm
from .predict import predict
from .request import PredictionRequest
from .scanplan import DwellOption, build_segments, choose_segments, order_for_retuning, search_intervals
from .species import Species

__all__ = ["PlanRequest", "PlanSpecies", "PlanResult", "make_plan", "signal_vs_temperature", "line_key", "LINE_KEY"]

#: Fields that identify a line across predictions (undefined quantum numbers are None).
LINE_KEY = ("species", "state", "j_up", "ka_up", "kc_up", "j_lo", "ka_lo", "kc_lo")

#: value_rule -> value of each target from the expected signals of all targets.
VALUE_RULES = {
    "signal": lambda signal: signal / np.max(signal),
    "count": lambda signal: np.ones_like(signal),
}


def _finite_number(name: str, value, minimum: float, strict: bool) -> None:
    if isinstance(value, bool) or not isinstance(value, (int, float)) or not math.isfinite(value):
        raise ValueError(f"{name} must be a finite number, got {value!r}")
    if value < minimum or (strict and value == minimum):
        raise ValueError(f"{name} must be {'>' if strict else '>='} {minimum:g}, got {value!r}")


@dataclass(frozen=True)
class PlanRequest:
    """Window, temperature and slot of one plan.

    Parameters
    ----------
    fmin_mhz, fmax_mhz : window [MHz], 0 <= fmin < fmax.
    temperature_k : temperature [K], 0 < T <= 5000.
    slot_s : time available, retuning included [s], > 0.
    snr : signal-to-noise ratio a target must reach, > 0.
    k_sigma : scan margin as a multiple of each line's 1σ [dimensionless], >= 0.
    margin_mhz : fixed extra margin on each side of each line [MHz], >= 0.
    setting_width_mhz : instantaneous bandwidth of one setting [MHz], > 0.
    channel_width_mhz : narrowest resolvable separation [MHz], > 0.
    retune_overhead_s : time lost per setting [s], >= 0.
    min_intensity_nm2mhz : lines below this intensity are not predicted [nm² MHz], >= 0.
    max_eu_k : lines with a higher upper-state energy are left out [K], >= 0; None = no limit.
    include_satellites : False leaves out the lines of excited vibrational states (each with its reason).
    """

    fmin_mhz: float
    fmax_mhz: float
    temperature_k: float
    slot_s: float
    snr: float = 5.0
    k_sigma: float = 3.0
    margin_mhz: float = 0.0
    setting_width_mhz: float = 1000.0
    channel_width_mhz: float = 0.1
    retune_overhead_s: float = 10.0
    min_intensity_nm2mhz: float = 0.0
    max_eu_k: float | None = None
    include_satellites: bool = True

    def __post_init__(self):
        if not isinstance(self.include_satellites, bool):
            raise ValueError(f"include_satellites must be True or False, got {self.include_satellites!r}")
        self.prediction_request()  # validates the window, temperature and intensity floor
        _finite_number("slot_s", self.slot_s, 0.0, strict=True)
        _finite_number("snr", self.snr, 0.0, strict=True)
        _finite_number("k_sigma", self.k_sigma, 0.0, strict=False)
        _finite_number("margin_mhz", self.margin_mhz, 0.0, strict=False)
        _finite_number("setting_width_mhz", self.setting_width_mhz, 0.0, strict=True)
        _finite_number("channel_width_mhz", self.channel_width_mhz, 0.0, strict=True)
        _finite_number("retune_overhead_s", self.retune_overhead_s, 0.0, strict=False)
        if self.max_eu_k is not None:
            _finite_number("max_eu_k", self.max_eu_k, 0.0, strict=False)

    def prediction_request(self, temperature_k: float | None = None, floor: bool = True) -> PredictionRequest:
        """The prediction of this window, at ``temperature_k`` (default: the plan's)."""
        return PredictionRequest(
            self.fmin_mhz,
            self.fmax_mhz,
            self.temperature_k if temperature_k is None else temperature_k,
            min_intensity_nm2mhz=self.min_intensity_nm2mhz if floor else 0.0,
        )


@dataclass(frozen=True)
class PlanSpecies:
    """A chosen species and its amount: mole fraction (absorption cell) or relative abundance, > 0.

    For an isotopologue the amount is that of the molecule in all its isotopic forms; the signal is
    weighted by ``isotopic_fraction``, the share of the molecules that are this isotopologue: given
    for an enriched sample, else the species' natural abundance (1 when the catalogue states none).
    """

    species: Species
    amount: float
    isotopic_fraction: float | None = None

    def __post_init__(self):
        if not isinstance(self.species, Species):
            raise ValueError(f"species must be an engine Species, got {type(self.species).__name__}")
        _finite_number(f"amount of {self.species.name}", self.amount, 0.0, strict=True)
        fraction = self.isotopic_fraction
        if fraction is not None:
            _finite_number(f"isotopic fraction of {self.species.name}", fraction, 0.0, strict=True)
            if fraction > 1:
                raise ValueError(
                    f"isotopic fraction of {self.species.name} must be <= 1 (not per cent), got {fraction}"
                )

    @property
    def fraction(self) -> float:
        """The isotopic weight used: the given fraction, else the natural abundance, else 1."""
        if self.isotopic_fraction is not None:
            return float(self.isotopic_fraction)
        return 1.0 if self.species.natural_abundance is None else float(self.species.natural_abundance)

    @property
    def effective_amount(self) -> float:
        """amount × fraction: what the sensitivity model sees."""
        return float(self.amount) * self.fraction


@dataclass
class PlanResult:
    """A plan: every ranked line (``targets``), the settings to observe, what is left out and why.

    ``targets`` holds every line that passed the energy cut, sorted by rank;
    ``selected`` marks those the scan detects.  Times may be inf here;
    :meth:`to_dict` gives None for them.
    """

    targets: list[dict]
    segments: list[dict]
    left_out: list[dict]
    totals: dict
    messages: list[str] = field(default_factory=list)
    model: dict = field(default_factory=dict)

    def to_dict(self) -> dict:
        """JSON-ready copy (non-finite numbers as None; json.dumps(..., allow_nan=False) accepts it)."""
        return _json_ready(
            {
                "targets": self.targets,
                "segments": self.segments,
                "left_out": self.left_out,
                "totals": self.totals,
                "messages": self.messages,
                "model": self.model,
            }
        )


def _json_ready(value):
    if isinstance(value, dict):
        return {key: _json_ready(item) for key, item in value.items()}
    if isinstance(value, (list, tuple)):
        return [_json_ready(item) for item in value]
    if isinstance(value, (bool, np.bool_)):
        return bool(value)
    if isinstance(value, (int, np.integer)):
        return int(value)
    if isinstance(value, (float, np.floating)):
        return float(value) if math.isfinite(value) else None
    return value


def line_key(record: dict) -> tuple:
    """(species, state, j_up, ka_up, kc_up, j_lo, ka_lo, kc_lo) of a line record; None = undefined."""
    return tuple(record[name] for name in LINE_KEY)


def _level(numbers) -> str:
    return " ".join(str(n) for n in numbers if n is not None)


def line_label(record: dict) -> str:
    """'SPECIES STATE J Ka Kc ← J Ka Kc' (undefined quantum numbers omitted)."""
    upper = _level(record[f"{q}_up"] for q in ("j", "ka", "kc"))
    lower = _level(record[f"{q}_lo"] for q in ("j", "ka", "kc"))
    return f"{record['species']} {record['state']} {upper} ← {lower}"


def _window_lines(prediction: Prediction, species: Species, request: PlanRequest) -> LineTable:
    """The lines of one species in the plan's window above its intensity floor."""
    lines = prediction.lines
    if not math.isclose(prediction.temperature_k, request.temperature_k, rel_tol=1e-12):
        raise ValueError(
            f"the prediction given for {species.name} is at {prediction.temperature_k:g} K, "
            f"the plan at {request.temperature_k:g} K"
        )
    keep = (
        (lines["species"] == species.name)
        & (lines["frequency_mhz"] >= request.fmin_mhz)
        & (lines["frequency_mhz"] <= request.fmax_mhz)
        & (lines["intensity_nm2mhz"] >= request.min_intensity_nm2mhz)
    )
    return lines.take(np.nonzero(keep)[0])


def _signals(model, table: LineTable, amounts: dict[str, float], temperature_k: float) -> np.ndarray:
    signal = np.zeros(len(table))
    for name, amount in amounts.items():
        rows = table["species"] == name
        if np.any(rows):
            signal[rows] = model.expected_signal(
                table["intensity_nm2mhz"][rows], table["doppler_fwhm_mhz"][rows], amount, temperature_k
            )
    return signal


def _blends(records: list[dict], widths: np.ndarray, blend_lines: LineTable) -> list[list[str]]:
    """For each record, the other lines of ``blend_lines`` closer than its resolvable width [MHz].

    A line with hyperfine structure spans its components, [ν + low, ν + high]:
    two lines blend when their spans come closer than the width.
    """
    order = np.argsort(blend_lines["frequency_mhz"], kind="stable")
    frequency = blend_lines["frequency_mhz"][order]
    other_low = blend_lines["frequency_mhz"] + np.minimum(blend_lines["hfs_low_mhz"], 0.0)
    other_high = blend_lines["frequency_mhz"] + np.maximum(blend_lines["hfs_high_mhz"], 0.0)
    reach = float(max(np.max(other_high - other_low, initial=0.0), 0.0))
    result = []
    for record, width in zip(records, widths):
        f = record["frequency_mhz"]
        low, high = f + min(record["hfs_low_mhz"], 0.0), f + max(record["hfs_high_mhz"], 0.0)
        first, last = np.searchsorted(frequency, [low - width - reach, high + width + reach], side="left")
        near = order[first : last + 1]
        near = near[(other_low[near] < high + width) & (other_high[near] > low - width)]
        found = []
        for other in blend_lines.take(near).records() if len(near) else []:
            if line_key(other) != line_key(record):
                found.append(f"{line_label(other)} at {other['frequency_mhz']:.4f} MHz")
        result.append(found)
    return result


def _dwell_options(members: list[int], time_s: np.ndarray, worth: np.ndarray) -> list[DwellOption]:
    """Option m: dwell for the m quickest targets of a segment (ties share one option)."""
    ranked = sorted(members, key=lambda i: time_s[i])
    options = []
    for position, index in enumerate(ranked):
        if position + 1 < len(ranked) and time_s[ranked[position + 1]] == time_s[index]:
            continue
        detected = tuple(ranked[: position + 1])
        options.append(DwellOption(float(time_s[index]), float(worth[list(detected)].sum()), detected))
    return options


def make_plan(
    request: PlanRequest,
    model,
    chosen: list[PlanSpecies],
    blend_lines: LineTable | None = None,
    predictions: dict[str, Prediction] | None = None,
    *,
    value_rule: str = "signal",
) -> PlanResult:
    """Ranked targets and a scan plan for ``chosen`` species that fits ``request.slot_s``.

    Parameters
    ----------
    request : window, temperature, slot and scan parameters.
    model : a sensitivity model (measurement.AbsorptionCell or RelativeModel).
    chosen : the species to plan, each with its amount.
    blend_lines : lines of every species that may blend with a target, in the
        window at the temperature; default: the chosen species' own lines.
        Give it above a sensible intensity floor: every line in it counts.
    predictions : ``predict`` results by species name to reuse (at the plan's
        temperature); species not in it are predicted here.
    value_rule : "signal" or "count", what a detected target is worth (module docstring).

    Raises ValueError for bad inputs and the engine's EngineLimitError when a
    species cannot be predicted at the temperature.
    """
    if value_rule not in VALUE_RULES:
        raise ValueError(f"value_rule must be one of {', '.join(VALUE_RULES)}, got {value_rule!r}")
    names = [p.species.name for p in chosen]
    duplicates = sorted({n for n in names if names.count(n) > 1})
    if duplicates:
        raise ValueError(f"species chosen twice: {', '.join(duplicates)}")
    if blend_lines is not None and not isinstance(blend_lines, LineTable):
        raise ValueError(f"blend_lines must be a LineTable, got {type(blend_lines).__name__}")
    predictions = predictions or {}
    messages: list[str] = []
    tables = []
    for item in chosen:
        prediction = predictions.get(item.species.name)
        if prediction is None:
            prediction = predict(item.species, request.prediction_request())
        messages.extend(prediction.messages)
        tables.append(_window_lines(prediction, item.species, request))
    lines = LineTable.concatenate(tables)
    amounts = {p.species.name: p.effective_amount for p in chosen}
    fractions = {p.species.name: p.fraction for p in chosen}

    too_hot = np.zeros(len(lines), dtype=bool)
    if request.max_eu_k is not None:
        too_hot = lines["eu_k"] > request.max_eu_k
    satellite = lines["vib_energy_cm1"] > 0
    excluded = satellite & ~too_hot if not request.include_satellites else np.zeros(len(lines), dtype=bool)
    kept = lines.take(np.nonzero(~too_hot & ~excluded)[0])
    signal = _signals(model, kept, amounts, request.temperature_k)
    time_s = time_to_snr_s(model, signal, request.snr)
    fwhm = voigt_fwhm(kept["doppler_fwhm_mhz"], model.pressure_hwhm_mhz())  # [1]
    rank = np.empty(len(kept), dtype=int)
    rank[np.lexsort((kept["frequency_mhz"], -signal))] = np.arange(1, len(kept) + 1)

    records = kept.records()
    resolvable = np.maximum(request.channel_width_mhz, fwhm)
    blends = _blends(records, resolvable, lines if blend_lines is None else blend_lines)

    # A target must fit the slot on its own, retuning included.
    within = time_s + request.retune_overhead_s <= request.slot_s
    target_index = np.nonzero(within)[0]
    lo, hi = search_intervals(
        kept["frequency_mhz"][target_index],
        kept["sigma_mhz"][target_index],
        fwhm[target_index] / 2.0,
        request.k_sigma,
        request.margin_mhz,
        kept["hfs_low_mhz"][target_index],
        kept["hfs_high_mhz"][target_index],
    )
    segments = build_segments(
        kept["frequency_mhz"][target_index], lo, hi, request.fmin_mhz, request.fmax_mhz, request.setting_width_mhz
    )
    worth = np.zeros(len(kept))
    if len(target_index):
        worth[target_index] = VALUE_RULES[value_rule](signal[target_index])
    options = [_dwell_options([int(target_index[i]) for i in s.target_indices], time_s, worth) for s in segments]
    choice = choose_segments(options, request.retune_overhead_s, request.slot_s)
    if not choice.optimal:
        messages.append("The optimiser stopped at its time limit: the plan fits the slot but may not be the best.")

    picked = [j for j, option in enumerate(choice.option_index) if option is not None]
    in_order = [picked[i] for i in order_for_retuning([segments[j] for j in picked])]
    number_of = {j: n for n, j in enumerate(in_order, start=1)}
    segment_of = {}  # line index -> segment index (every target)
    for j, s in enumerate(segments):
        for i in s.target_indices:
            segment_of[int(target_index[i])] = j
    search = {int(target_index[i]): (float(lo[i]), float(hi[i])) for i in range(len(target_index))}

    dwell_total = sum(options[j][choice.option_index[j]].dwell_s for j in picked)
    overhead_total = request.retune_overhead_s * len(picked)
    time_left = request.slot_s - dwell_total - overhead_total

    segment_rows = []
    for j in in_order:
        option = options[j][choice.option_index[j]]
        segment_rows.append(
            {
                "number": number_of[j],
                "start_mhz": segments[j].start_mhz,
                "stop_mhz": segments[j].stop_mhz,
                "dwell_s": option.dwell_s,
                "overhead_s": request.retune_overhead_s,
                "value": option.value,
                "target_ranks": sorted(int(rank[i]) for i in option.detected),
            }
        )

    targets, left_out, uncovered = [], [], 0
    for i, record in enumerate(records):
        j = segment_of.get(i)
        chosen_option = options[j][choice.option_index[j]] if j is not None and j in number_of else None
        selected = chosen_option is not None and i in chosen_option.detected
        reason = None if selected else _reason(i, j, chosen_option, time_s, time_left, options, number_of, request)
        covered = None
        if chosen_option is not None:
            s = segments[j]
            covered = s.start_mhz <= search[i][0] + 1e-9 and search[i][1] <= s.stop_mhz + 1e-9
            uncovered += not covered
        snr_reached = None
        if chosen_option is not None:
            snr_reached = request.snr * math.sqrt(chosen_option.dwell_s / time_s[i]) if time_s[i] > 0 else math.inf
        target = {
            "rank": int(rank[i]),
            **{name: record[name] for name in LINE_KEY},
            "frequency_mhz": record["frequency_mhz"],
            "sigma_mhz": record["sigma_mhz"],
            "eu_k": record["eu_k"],
            "el_k": record["el_k"],
            "s_mu2_d2": record["s_mu2_d2"],
            "einstein_a_s": record["einstein_a_s"],
            "intensity_nm2mhz": record["intensity_nm2mhz"],
            "doppler_fwhm_mhz": record["doppler_fwhm_mhz"],
            "fwhm_mhz": float(fwhm[i]),
            "vib_energy_cm1": record["vib_energy_cm1"],
            "satellite": record["vib_energy_cm1"] > 0,
            "hfs_low_mhz": record["hfs_low_mhz"],
            "hfs_high_mhz": record["hfs_high_mhz"],
            "amount": amounts[record["species"]],
            "isotopic_fraction": fractions[record["species"]],
            "expected_signal": float(signal[i]),
            "time_to_snr_s": float(time_s[i]),
            "blends": blends[i],
            "within_slot": bool(within[i]),
            "selected": selected,
            "segment": number_of.get(j) if j is not None else None,
            "search_lo_mhz": search[i][0] if i in search else None,
            "search_hi_mhz": search[i][1] if i in search else None,
            "search_covered": covered,
            "snr_reached": snr_reached,
            "reason": reason,
        }
        targets.append(target)
        if reason is not None:
            left_out.append(_left_out_row(target, reason))
    targets.sort(key=lambda t: t["rank"])
    left_out.sort(key=lambda t: t["rank"])
    hot = lines.take(np.nonzero(too_hot)[0]).records()
    for record in hot:
        reason = f"above max Eu: E_u = {record['eu_k']:.1f} K > {request.max_eu_k:g} K"
        left_out.append(_left_out_row({"rank": None, **record}, reason))
    for record in lines.take(np.nonzero(excluded)[0]).records():
        reason = f"vibrational satellite ({record['state']}, {record['vib_energy_cm1']:.0f} cm⁻¹): satellites excluded"
        left_out.append(_left_out_row({"rank": None, **record}, reason))

    if uncovered:
        messages.append(
            f"{uncovered} scheduled line(s) have a search interval (±{request.k_sigma:g} σ and margin) wider "
            "than their setting or cut by the window; only the part inside the setting is observed."
        )
    if not len(lines):
        messages.append("No lines of the chosen species in the window: nothing to plan.")
    elif not len(target_index):
        messages.append(f"No line reaches SNR {request.snr:g} within the slot of {request.slot_s:g} s.")
    totals = {
        "slot_s": float(request.slot_s),
        "used_s": dwell_total + overhead_total,
        "dwell_s": dwell_total,
        "overhead_s": overhead_total,
        "line_count": len(kept),
        "target_count": int(len(target_index)),
        "selected_count": sum(t["selected"] for t in targets),
        "segment_count": len(picked),
        "value": choice.value,
        "optimal": choice.optimal,
    }
    model_info = model.describe() if hasattr(model, "describe") else {"kind": getattr(model, "kind", "")}
    model_info["value_rule"] = value_rule
    return PlanResult(targets, segment_rows, left_out, totals, messages, model_info)


def _left_out_row(target: dict, reason: str) -> dict:
    return {
        "rank": target["rank"],
        **{name: target[name] for name in LINE_KEY},
        "frequency_mhz": target["frequency_mhz"],
        "time_to_snr_s": target.get("time_to_snr_s"),
        "reason": reason,
    }


_UNITS_S = (("years", 365.25 * 86400.0), ("days", 86400.0), ("h", 3600.0), ("min", 60.0))


def duration_text(seconds: float) -> str:
    """A time [s] as people read it: '45 s', '12 min', '3.2 h', '40 days', '2.4e+03 years'."""
    for unit, size in _UNITS_S:
        if seconds >= 2 * size:
            value = seconds / size
            return f"{value:.3g} {unit}" if value < 1e4 else f"{value:.2g} {unit}"
    return f"{seconds:.3g} s"


def _reason(i, j, chosen_option, time_s, time_left, options, number_of, request) -> str:
    """Why line i is not scheduled."""
    need = time_s[i]
    if not need + request.retune_overhead_s <= request.slot_s:
        if not math.isfinite(need):
            return "no expected signal: it can never reach the SNR"
        extra = f" plus {request.retune_overhead_s:g} s retuning" if request.retune_overhead_s else ""
        return f"would need {duration_text(need)}{extra}, more than the slot ({duration_text(request.slot_s)})"
    if j is None:
        return "centre outside the window"
    if j not in number_of:
        cheapest = min(o.dwell_s for o in options[j]) + request.retune_overhead_s
        return f"segment not chosen: slot full ({max(time_left, 0.0):.3g} s left, the segment needs {cheapest:.3g} s)"
    return (
        f"needs more dwell than chosen for its segment (needs {need:.3g} s, "
        f"segment {number_of[j]} gets {chosen_option.dwell_s:.3g} s)"
    )


def signal_vs_temperature(
    request: PlanRequest, model, chosen: list[PlanSpecies], target_keys, temperatures_k, predict_function=None
) -> dict:
    """Expected signal of some lines at several temperatures, for a plot of which temperature favours them.

    ``target_keys`` are :data:`LINE_KEY` tuples (see :func:`line_key`);
    ``temperatures_k`` [K].  Returns key -> list of expected signals (the
    model's unit), one per temperature, 0 where the line is not predicted
    and NaN where the engine refuses the species at that temperature.
    The plan's intensity floor is not applied, so curves do not jump to 0
    where a line crosses it.  ``predict_function(species, request)`` stands
    in for :func:`predict` (a caller may pass a caching one).
    """
    predict_function = predict_function or predict
    amounts = {p.species.name: p.effective_amount for p in chosen}
    by_name = {p.species.name: p.species for p in chosen}
    keys = [tuple(k) for k in target_keys]
    unknown = sorted({k[0] for k in keys if k[0] not in by_name})
    if unknown:
        raise ValueError(f"target_keys name species that are not chosen: {', '.join(unknown)}")
    wanted = sorted({k[0] for k in keys})
    curves = {key: [] for key in keys}
    for temperature in temperatures_k:
        window = request.prediction_request(temperature_k=float(temperature), floor=False)
        found: dict[tuple, float] = {}
        refused: set[str] = set()
        for name in wanted:
            try:
                table = predict_function(by_name[name], window).lines
            except ValueError:  # e.g. EngineLimitError: no prediction at this temperature, not a zero signal
                refused.add(name)
                continue
            signal = _signals(model, table, {name: amounts[name]}, float(temperature))
            for record, value in zip(table.records(), signal.tolist()):
                found[line_key(record)] = value
        for key in keys:
            curves[key].append(float("nan") if key[0] in refused else found.get(key, 0.0))
    return curves
