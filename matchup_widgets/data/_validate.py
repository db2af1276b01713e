"""Validation of a plate-appearance table: normalise types, count problems, decide.

Everything here is written as ibis expressions, so the checks run on the engine that
holds the data (DuckDB by default) in a handful of vectorised queries: one aggregate
pass that counts every kind of problem, a few small example queries only when
something is wrong, and one query that builds the cleaned table.

Policy (what is dropped, what is repaired, what is fatal)
---------------------------------------------------------
Unusable, raise :class:`DataError` (all problems found are listed in one paragraph):
    a required column is missing; the table has no rows; an outcome code that is not
    one of ``OUTCOMES`` (map it with ``outcome_map``); ``batter_hand`` or
    ``pitcher_hand`` not ``L``/``R`` (missing counts as wrong); ``game_date`` text that
    is not a date; ``season`` that is not a whole year; ``inning``, ``outs_*``,
    ``bases_*`` or ``runs_on_play`` outside their ranges or not whole numbers; a
    column whose type cannot hold its values (numbers for a date, and so on); no
    rows left after dropping.
Dropped, with a count per reason in the report:
    rows with no ``game_id``, ``game_date``, ``batter_id``, ``pitcher_id`` or
    ``outcome``; rows whose outcome code ``outcome_map`` sends to ``None``; exact
    duplicate rows (every input column equal), first copy kept, when the table can tell
    plate appearances apart (see below).
Repaired, with a count and a warning:
    ``exit_velo`` outside 0-130 mph or ``launch_angle`` outside -90..90 degrees (or
    text that is not a number) is set to missing, the plate appearance is kept;
    a missing ``batter_name``/``pitcher_name`` is filled with the id.
Allowed and counted:
    a batted-ball outcome with no exit velocity.
Normalised silently:
    ids and names become text (numbers such as 1001 or 1001.0 become "1001"; an empty
    id is missing); hands and outcome codes are upper-cased with blanks removed;
    ``season`` is the year of ``game_date`` where absent.
With ``strict=True`` every drop and every repair is an error instead.

Duplicates are judged on every input column, mapped or not: a per-plate-appearance key
(an event number) keeps two identical-looking plate appearances apart. A table with only
the contract's other columns cannot tell a copied row from a real repeat (a batter who
grounds out twice against the same starter in one game writes two identical rows; about
one row in ten of a full season), and dropping those would bias every rate toward the
rarer outcomes. So by default (``drop_duplicates=None``) exact duplicates are dropped only
when the table has ``inning``, ``outs_before``, ``bases_before`` or a column outside the
contract; otherwise they are kept, counted (``n_repeated_rows``) and named in a warning.
``True`` or ``False`` decide either way. On DuckDB a 64-bit row hash screens for
duplicates first, so clean data skips the DISTINCT.
Engines without a lenient cast (polars) parse text dates strictly; a bad date then
fails in the engine and :func:`load_pas` reports it as a :class:`DataError`.
"""

from __future__ import annotations

import difflib
from dataclasses import asdict, dataclass, field
from typing import Any

import ibis
import ibis.expr.datatypes as dt
import ibis.expr.types as ir

from ._errors import DataError
from ._schema import (
    BASE_OUT_COLUMNS,
    BATTED,
    EXIT_VELO_RANGE,
    HANDS,
    LAUNCH_ANGLE_RANGE,
    OPTIONAL_COLUMNS,
    OUTCOMES,
    REQUIRED_COLUMNS,
)

# Whole-number columns and their accepted inclusive ranges.
_INT_RANGES: dict[str, tuple[int, int]] = {
    "inning": (1, 99),
    "outs_before": (0, 2),
    "bases_before": (0, 7),
    "outs_after": (0, 3),
    "bases_after": (0, 7),
    "runs_on_play": (0, 4),
}
_SEASON_RANGE: tuple[int, int] = (1800, 2300)
_FLOAT_RANGES: dict[str, tuple[float, float]] = {
    "exit_velo": EXIT_VELO_RANGE,
    "launch_angle": LAUNCH_ANGLE_RANGE,
}
_KEY_COLUMNS: tuple[str, ...] = ("game_id", "game_date", "batter_id", "pitcher_id", "outcome")
_TEXT_COLUMNS: tuple[str, ...] = ("game_id", "batter_id", "pitcher_id", "batter_name", "pitcher_name")
_N_EXAMPLES = 5
# Contract columns that tell two plate appearances of one batter against one pitcher in
# one game apart (any column outside the contract is taken to do so as well).
_PA_KEY_COLUMNS: tuple[str, ...] = ("inning", "outs_before", "bases_before")


@dataclass
class ValidationReport:
    """What loading found in a plate-appearance table.

    Attributes
    ----------
    n_read : int
        Rows read from the source.
    n_kept : int
        Rows in the validated table.
    dropped : dict of str to int
        Rows dropped, per reason (only reasons that occurred).
    warnings : list of str
        Readable notes about repaired values and other things worth knowing.
    has_contact : bool
        Both ``exit_velo`` and ``launch_angle`` are present with at least one value.
    has_base_out : bool
        Every base-out column (``outs_before`` ... ``runs_on_play``) is present.
    set_missing : dict of str to int
        Values set to missing or filled in, per reason.
    n_batted_without_exit_velo : int
        Kept batted-ball plate appearances with no exit velocity (allowed).
    n_repeated_rows : int
        Rows identical to an earlier row that were kept, because the table has no column
        that tells plate appearances apart (``drop_duplicates=None``).
    columns : list of str
        Columns of the validated table.
    source : str
        A short description of where the rows came from.

    Examples
    --------
    >>> r = ValidationReport(n_read=3, n_kept=2, dropped={"duplicate row": 1})
    >>> r.to_dict()["dropped"]
    {'duplicate row': 1}
    >>> print(r.summary().splitlines()[0])
    Read 3 plate appearances, kept 2, dropped 1 (duplicate row: 1).
    """

    n_read: int
    n_kept: int
    dropped: dict[str, int] = field(default_factory=dict)
    warnings: list[str] = field(default_factory=list)
    has_contact: bool = False
    has_base_out: bool = False
    set_missing: dict[str, int] = field(default_factory=dict)
    n_batted_without_exit_velo: int = 0
    n_repeated_rows: int = 0
    columns: list[str] = field(default_factory=list)
    source: str = ""

    def to_dict(self) -> dict[str, Any]:
        """Return the report as plain JSON-ready values."""
        return asdict(self)

    def summary(self) -> str:
        """Return a few lines of text for people."""
        n_dropped = sum(self.dropped.values())
        line = f"Read {self.n_read:,} plate appearances, kept {self.n_kept:,}"
        if n_dropped:
            parts = ", ".join(f"{k}: {v:,}" for k, v in self.dropped.items())
            line += f", dropped {n_dropped:,} ({parts})"
        lines = [line + "."]
        if self.source:
            lines.append(f"Source: {self.source}.")
        if self.has_contact:
            lines.append("Contact data: yes (exit velocity and launch angle).")
        else:
            lines.append("Contact data: no (needs exit_velo and launch_angle).")
        lines.append(
            "Base-out data: " + ("yes." if self.has_base_out else "no (needs " + ", ".join(BASE_OUT_COLUMNS) + ").")
        )
        lines.extend(f"Warning: {w}" for w in self.warnings)
        return "\n".join(lines)


@dataclass
class _Checked:
    """Internal result of :func:`check_table`: the cleaned expression and the counts so far."""

    table: ir.Table
    n_read: int
    n_before_dedupe: int
    dropped: dict[str, int]
    set_missing: dict[str, int]
    warnings: list[str]
    n_kept: int | None  # None: duplicates were removed, count the final table
    n_ev: int
    n_batted_no_ev: int
    n_repeated: int = 0  # identical rows kept (a table with no per-plate-appearance key)


@ibis.udf.scalar.builtin(name="hash")
def _duckdb_hash(value) -> dt.uint64:  # type: ignore[empty-body]
    """DuckDB's own 64-bit hash (ibis's ``hash()`` adds casts that cost more than the hash)."""


def _plural(n: int, word: str) -> str:
    return f"{n:,} {word}" if n == 1 else f"{n:,} {word}s"


def _dtype_kind(dtype) -> str:
    if dtype.is_string():
        return "string"
    if dtype.is_boolean():
        return "boolean"
    if dtype.is_integer():
        return "integer"
    if dtype.is_floating() or dtype.is_decimal():
        return "floating"
    if dtype.is_date():
        return "date"
    if dtype.is_timestamp():
        return "timestamp"
    if dtype.is_null() or dtype.is_unknown():  # an all-missing column
        return "null"
    return "other"


def _type_error(column: str, dtype, expected: str) -> str:
    return (
        f"Column '{column}' has type {dtype}, which cannot hold {expected}; "
        f"convert it (or map another column onto '{column}') before loading."
    )


def _text(col: ir.Value, kind: str, *, strip: bool = False) -> ir.StringValue:
    """A column as text; an empty string counts as missing; ``strip`` removes blanks."""
    if kind == "null":
        return ibis.null("string")
    if kind == "floating":
        # 1001.0 -> "1001": ids stored as floats (a CSV column with gaps) read back as keys
        whole = col.cast("float64")
        col = (whole == whole.floor()).ifelse(whole.cast("int64").cast("string"), whole.cast("string"))
    s = col if kind == "string" else col.cast("string")
    return (s.strip() if strip else s).nullif("")


def _number(col: ir.Value, kind: str) -> tuple[ir.FloatingValue, ir.BooleanValue]:
    """A float64 version of ``col`` (NaN as missing) and a flag for text that is not a number."""
    if kind == "string":
        s = col.strip()
        num = s.try_cast("float64")
        not_number = s.notnull() & (s != "") & num.isnull()
    elif kind == "null":
        return ibis.null("float64"), ibis.literal(False)
    else:
        num = col if col.type() == ibis.dtype("float64") else col.cast("float64")
        not_number = ibis.literal(False)
        if kind != "floating":
            return num, not_number  # integers have no NaN
    num = num.isnan().ifelse(ibis.null("float64"), num)
    return num, not_number


class _Problems:
    """Collects fatal problems as sentences, with example values fetched on demand."""

    def __init__(self, raw: ir.Table) -> None:
        self.raw = raw
        self.sentences: list[str] = []

    def examples(self, cond: ir.BooleanValue, column: str) -> str:
        raw = self.raw
        value = raw[column].cast("string")
        rows = (
            raw.filter(cond)
            .group_by(value=value)
            .aggregate(n=ibis._.count())
            .order_by([ibis.desc("n"), "value"])
            .limit(_N_EXAMPLES)
            .to_pyarrow()
            .to_pylist()
        )
        shown = [
            ("missing" if r["value"] is None else repr(r["value"])) + f" ({_plural(int(r['n']), 'row')})"
            for r in rows
        ]
        return ", ".join(shown)


def check_columns(columns: list[str]) -> None:
    """Raise :class:`DataError` when a required column is missing.

    Parameters
    ----------
    columns : list of str
        The table's column names after any mapping.

    Raises
    ------
    DataError
        Naming each missing column, the closest names present and how to map them.

    Examples
    --------
    >>> check_columns(list(REQUIRED_COLUMNS))
    >>> try:
    ...     check_columns([c for c in REQUIRED_COLUMNS if c != "outcome"] + ["Result"])
    ... except DataError as exc:
    ...     print(str(exc)[:58])
    The table has no required column 'outcome'. Columns found:
    """
    missing = [c for c in REQUIRED_COLUMNS if c not in columns]
    if not missing:
        return
    found = ", ".join(repr(c) for c in columns[:15]) + (", ..." if len(columns) > 15 else "")
    hints = []
    # suggest only columns that are not already contract columns
    contract = set(REQUIRED_COLUMNS) | set(OPTIONAL_COLUMNS)
    lowered = {str(c).lower(): c for c in columns if c not in contract}
    for name in missing:
        close = difflib.get_close_matches(name, list(lowered), n=1, cutoff=0.5)
        if close:
            hints.append(f"'{lowered[close[0]]}': '{name}'")
    which = ", ".join(repr(c) for c in missing)
    noun = "column" if len(missing) == 1 else "columns"
    msg = f"The table has no required {noun} {which}. Columns found: {found or 'none'}."
    if hints:
        msg += f" If yours are named differently, pass a mapping such as {{{', '.join(hints)}}}"
    else:
        msg += " Rename yours with a mapping {their_name: our_name}"
    msg += " (mapping= in Python, --mapping FILE.json on the command line)."
    raise DataError(msg)


def _normalise_outcome_map(outcome_map: dict | None) -> dict[str, str | None]:
    if outcome_map is None:
        return {}
    if not isinstance(outcome_map, dict):
        msg = f"outcome_map must be a dict {{raw_code: code or None}}, got {type(outcome_map).__name__}."
        raise DataError(msg)
    out: dict[str, str | None] = {}
    bad = []
    for key, value in outcome_map.items():
        if value is not None and str(value).strip().upper() not in OUTCOMES:
            bad.append(f"{key!r}: {value!r}")
        out[str(key).strip().upper()] = None if value is None else str(value).strip().upper()
    if bad:
        msg = (
            f"outcome_map sends codes to values that are not outcome codes: {', '.join(bad[:5])}. "
            f"Map each raw code to one of {', '.join(OUTCOMES)}, or to None to drop it."
        )
        raise DataError(msg)
    return out


def check_table(
    raw: ir.Table,
    *,
    outcome_map: dict | None = None,
    strict: bool = False,
    drop_duplicates: bool | None = None,
) -> _Checked:
    """Validate an ibis table already renamed to the contract; see the module policy.

    Returns the cleaned (lazy) table expression and the counts gathered so far. Raises
    :class:`DataError` with every fatal problem in one paragraph.
    """
    columns = list(raw.columns)
    check_columns(columns)
    contract = set(REQUIRED_COLUMNS) | set(OPTIONAL_COLUMNS)
    keyed = any(c in _PA_KEY_COLUMNS or c not in contract for c in columns)
    drop = keyed if drop_duplicates is None else bool(drop_duplicates)
    # with the default on a key-less table, identical rows are kept but still counted
    screen = drop or drop_duplicates is None
    schema = raw.schema()
    kinds = {c: _dtype_kind(schema[c]) for c in columns}
    codes_map = _normalise_outcome_map(outcome_map)
    type_problems: list[str] = []

    # ---- a cheap first pass: do hands and codes need normalising? -------------------
    # Clean data (the usual case) then skips per-row string work in every later query.
    accepted = sorted(set(OUTCOMES) | set(codes_map))
    pre: dict[str, ir.Value] = {"n_read": raw.count()}
    for c, allowed in (("batter_hand", list(HANDS)), ("pitcher_hand", list(HANDS)), ("outcome", accepted)):
        if kinds[c] == "string":
            pre[c] = (raw[c].notnull() & ~raw[c].isin(allowed)).sum()
    first = {k: int(v or 0) for k, v in raw.aggregate(**pre).to_pyarrow().to_pylist()[0].items()}
    if first["n_read"] == 0:
        msg = (
            "The table has no rows (an empty file, or only a header). "
            "Point to a file with plate appearances, one row each."
        )
        raise DataError(msg)
    as_is = {c for c in ("batter_hand", "pitcher_hand", "outcome") if first.get(c, 1) == 0}

    # ---- normalised expressions over the raw columns -------------------------------
    out: dict[str, ir.Value] = {}
    for c in _TEXT_COLUMNS:
        if kinds[c] in ("other",):
            type_problems.append(_type_error(c, schema[c], "text keys or names"))
            continue
        out[c] = _text(raw[c], kinds[c])

    for c in ("batter_hand", "pitcher_hand"):
        if c in as_is:
            out[c] = raw[c]
        elif kinds[c] != "other":
            out[c] = _text(raw[c], kinds[c], strip=True).upper()
        else:
            type_problems.append(_type_error(c, schema[c], "hands (L/R)"))

    if "outcome" in as_is:
        raw_code = raw["outcome"]
    elif kinds["outcome"] != "other":
        raw_code = _text(raw["outcome"], kinds["outcome"], strip=True).upper()
    else:
        raw_code = None
        type_problems.append(_type_error("outcome", schema["outcome"], "outcome codes"))
    mapped = {k: v for k, v in codes_map.items() if v is not None}
    dropped_codes = sorted(k for k, v in codes_map.items() if v is None)
    code = raw_code.substitute(mapped) if (raw_code is not None and mapped) else raw_code

    kind = kinds["game_date"]
    bad_date = ibis.literal(False)
    date_missing = None
    if kind == "date":
        date = raw["game_date"]
    elif kind == "timestamp":
        date = raw["game_date"].date()
    elif kind == "string":
        s = raw["game_date"].strip()
        date_missing = s.isnull() | (s == "")
        if raw.get_backend().name == "duckdb":
            # ISO text, or a timestamp written as text ("2031-04-02 19:05:00")
            date = ibis.coalesce(s.try_cast("date"), s.try_cast("timestamp").date())
            bad_date = ~date_missing & date.isnull()
        else:
            # engines without a lenient cast parse strictly; a bad date fails in the engine
            # and load_pas reports that error as a DataError
            date = date_missing.ifelse(ibis.null("date"), s.cast("date"))
    elif kind == "null":
        date = ibis.null("date")
    else:
        date = None
        type_problems.append(_type_error("game_date", schema["game_date"], "dates (use YYYY-MM-DD)"))

    if type_problems:
        raise DataError(" ".join(type_problems))

    out["outcome"] = code
    out["game_date"] = date

    # ---- optional columns ------------------------------------------------------------
    int_checks: dict[str, ir.BooleanValue] = {}
    float_checks: dict[str, tuple[ir.BooleanValue, ir.BooleanValue]] = {}
    for c in OPTIONAL_COLUMNS:
        if c not in columns or c == "season":
            continue
        if kinds[c] in ("date", "timestamp", "other"):
            type_problems.append(_type_error(c, schema[c], "numbers"))
            continue
        if kinds[c] == "boolean":
            type_problems.append(_type_error(c, schema[c], "numbers (it holds true/false)"))
            continue
        if c in _INT_RANGES and kinds[c] == "integer":
            # already whole numbers: only the range needs checking
            lo, hi = _INT_RANGES[c]
            col = raw[c]
            int_checks[c] = col.notnull() & ~col.between(lo, hi)
            out[c] = col if schema[c] == ibis.dtype("int64") else col.cast("int64")
            continue
        num, not_number = _number(raw[c], kinds[c])
        if c in _INT_RANGES:
            lo, hi = _INT_RANGES[c]
            bad = not_number | (num.notnull() & ((num != num.floor()) | (num < lo) | (num > hi)))
            int_checks[c] = bad
            out[c] = bad.ifelse(ibis.null("int64"), num.cast("int64"))
        else:
            lo, hi = _FLOAT_RANGES[c]
            out_of_range = num.notnull() & ((num < lo) | (num > hi))
            float_checks[c] = (not_number, out_of_range)
            out[c] = out_of_range.ifelse(ibis.null("float64"), num)

    season_bad = ibis.literal(False)
    if "season" in columns:
        if kinds["season"] in ("date", "timestamp", "other", "boolean"):
            type_problems.append(_type_error("season", schema["season"], "years"))
        else:
            num, not_number = _number(raw["season"], kinds["season"])
            lo, hi = _SEASON_RANGE
            season_bad = not_number | (num.notnull() & ((num != num.floor()) | (num < lo) | (num > hi)))
            season = ibis.coalesce(season_bad.ifelse(ibis.null("int64"), num.cast("int64")), date.year().cast("int64"))
    else:
        season = date.year().cast("int64")
    if type_problems:
        raise DataError(" ".join(type_problems))
    out["season"] = season

    # ---- one aggregate pass: every other count we need ---------------------------------
    is_missing = {c: out[c].isnull() for c in _KEY_COLUMNS}
    if date_missing is not None:  # text that is no date is an error below, not a missing date
        is_missing["game_date"] = date_missing
    code_dropped = raw_code.isin(dropped_codes) if dropped_codes else ibis.literal(False)
    drop_reasons: dict[str, ir.BooleanValue] = {}
    earlier = ibis.literal(False)
    for c in _KEY_COLUMNS:
        drop_reasons[f"missing {c}"] = is_missing[c] & ~earlier
        earlier = earlier | is_missing[c]
    for k in dropped_codes:
        drop_reasons[f"outcome {k} mapped to None"] = (raw_code == k) & ~earlier
    dropped_any = earlier | code_dropped

    unknown_code = ~dropped_any & ~code.isin(list(OUTCOMES))
    bad_hand = {c: ~dropped_any & (out[c].isnull() | ~out[c].isin(list(HANDS))) for c in ("batter_hand", "pitcher_hand")}
    # Per-row flags are computed once in a projection; the aggregate then only combines
    # booleans (smaller SQL, and no expression evaluated twice per row).
    flags: dict[str, ir.Value] = {f"miss_{i}": is_missing[c] for i, c in enumerate(_KEY_COLUMNS)}
    flags.update({f"code_{i}": raw_code == k for i, k in enumerate(dropped_codes)})
    flags["err_outcome"] = ~code.isin(list(OUTCOMES))
    for c in ("batter_hand", "pitcher_hand"):
        flags[f"err_{c}"] = out[c].isnull() | ~out[c].isin(list(HANDS))
    flags["err_game_date"] = bad_date
    flags["err_season"] = season_bad
    for c, cond in int_checks.items():
        flags[f"err_{c}"] = cond
    for c, (not_number, out_of_range) in float_checks.items():
        flags[f"fix_{c}_text"] = not_number
        flags[f"fix_{c}_range"] = out_of_range
    for c in ("batter_name", "pitcher_name"):
        flags[f"fix_{c}"] = out[c].isnull()
    if "exit_velo" in out:
        flags["has_ev"] = out["exit_velo"].notnull()
        flags["batted_no_ev"] = code.isin(list(BATTED)) & out["exit_velo"].isnull()
    if screen and raw.get_backend().name == "duckdb":
        # Screening for exact duplicates with a 64-bit row hash: equal rows always hash
        # equal, so "no duplicates" is exact; a collision only triggers the exact DISTINCT.
        flags["row_hash"] = _duckdb_hash(ibis.struct({c: raw[c] for c in columns}))
    f = raw.select(**flags)
    seen = ibis.literal(False)
    aggs: dict[str, ir.Value] = {"n_read": f.count()}
    for i, c in enumerate(_KEY_COLUMNS):
        aggs[f"drop::missing {c}"] = (f[f"miss_{i}"] & ~seen).sum()
        seen = seen | f[f"miss_{i}"]
    for i, k in enumerate(dropped_codes):
        aggs[f"drop::outcome {k} mapped to None"] = (f[f"code_{i}"] & ~seen).sum()
    kept_row = ~seen
    for i in range(len(dropped_codes)):
        kept_row = kept_row & ~f[f"code_{i}"]
    for name in flags:
        if name.startswith(("err_", "fix_")):
            key = name.replace("err_", "err::", 1).replace("fix_", "fix::", 1)
            aggs[key] = (kept_row & f[name]).sum()
    if "has_ev" in flags:
        aggs["n_ev"] = (kept_row & f["has_ev"]).sum()
        aggs["n_batted_no_ev"] = (kept_row & f["batted_no_ev"]).sum()
    if "row_hash" in flags:
        aggs["n_distinct_hash"] = f["row_hash"].nunique(where=kept_row)
    counts = {k: int(v or 0) for k, v in f.aggregate(**aggs).to_pyarrow().to_pylist()[0].items()}

    n_read = counts["n_read"]

    # ---- fatal problems, with examples -----------------------------------------------
    problems = _Problems(raw)
    if counts["err::outcome"]:
        n = counts["err::outcome"]
        allowed = ", ".join(OUTCOMES)
        problems.sentences.append(
            f"Column 'outcome' holds codes that are not outcome codes in {_plural(n, 'row')}: "
            f"{problems.examples(unknown_code, 'outcome')}. Allowed codes are {allowed}; map the "
            "others with outcome_map, e.g. {'SAC': None, 'E': 'GB_OUT'} (None drops those rows with a count)."
        )
    for c in ("batter_hand", "pitcher_hand"):
        n = counts[f"err::{c}"]
        if n:
            problems.sentences.append(
                f"Column '{c}' is not L or R in {_plural(n, 'row')}: "
                f"{problems.examples(bad_hand[c], c)}. Recode them to L/R "
                "(a switch hitter's side is the side they batted from in that plate appearance) "
                "or drop those rows before loading."
            )
    if counts["err::game_date"]:
        n = counts["err::game_date"]
        problems.sentences.append(
            f"Column 'game_date' is not a date in {_plural(n, 'row')}: "
            f"{problems.examples(~dropped_any & bad_date, 'game_date')}. Write dates as YYYY-MM-DD."
        )
    if counts["err::season"]:
        n = counts["err::season"]
        problems.sentences.append(
            f"Column 'season' is not a whole year between "
            f"{_SEASON_RANGE[0]} and {_SEASON_RANGE[1]} in {_plural(n, 'row')}: {problems.examples(~dropped_any & season_bad, 'season')}. "
            "Fix them, or leave the column out and the season is taken from game_date."
        )
    for c, cond in int_checks.items():
        n = counts[f"err::{c}"]
        if n:
            lo, hi = _INT_RANGES[c]
            problems.sentences.append(
                f"Column '{c}' is not a whole number from {lo} to {hi} in {_plural(n, 'row')}: "
                f"{problems.examples(~dropped_any & cond, c)}. Correct them, or leave the column out "
                "(base-out features then switch off)."
            )
    if problems.sentences:
        raise DataError(" ".join(problems.sentences))

    dropped = {k.removeprefix("drop::"): v for k, v in counts.items() if k.startswith("drop::") and v}
    set_missing: dict[str, int] = {}
    warnings: list[str] = []
    for c in float_checks:
        lo, hi = _FLOAT_RANGES[c]
        unit = "mph" if c == "exit_velo" else "degrees"
        n_text, n_range = counts[f"fix::{c}_text"], counts[f"fix::{c}_range"]
        if n_range:
            set_missing[f"{c} outside {lo:g}..{hi:g}"] = n_range
            warnings.append(
                f"{_plural(n_range, 'value')} of {c} outside {lo:g}..{hi:g} {unit} set to missing "
                "(the plate appearances are kept)."
            )
        if n_text:
            set_missing[f"{c} not a number"] = n_text
            warnings.append(f"{_plural(n_text, 'value')} of {c} that are not numbers set to missing.")
    for c in ("batter_name", "pitcher_name"):
        n = counts[f"fix::{c}"]
        if n:
            id_col = c.replace("_name", "_id")
            set_missing[f"{c} filled from {id_col}"] = n
            warnings.append(f"{_plural(n, 'row')} with no {c}: the {id_col} is shown instead.")
            out[c] = ibis.coalesce(out[c], out[id_col])

    if strict and (dropped or set_missing):
        found = "; ".join(f"{k}: {v:,}" for k, v in {**dropped, **set_missing}.items())
        msg = (
            f"strict=True and the table needs rows dropped or values repaired ({found}). "
            "Fix those rows in the source, or load with strict=False to drop/repair them with a count."
        )
        raise DataError(msg)

    n_before_dedupe = n_read - sum(dropped.values())
    if n_before_dedupe == 0:
        found = "; ".join(f"{k}: {v:,}" for k, v in dropped.items())
        msg = f"Every row was dropped ({found}); nothing is left to analyse. Fix the source or the outcome_map."
        raise DataError(msg)

    final_cols = [c for c in REQUIRED_COLUMNS if c != "game_date"]
    final_cols = ["game_id", "game_date", "season"] + [c for c in final_cols if c != "game_id"]
    final_cols += [c for c in OPTIONAL_COLUMNS if c in out and c != "season"]
    maybe_repeats = screen and counts.get("n_distinct_hash", -1) != n_before_dedupe
    dedupe = drop and maybe_repeats
    # Every input column rides along, as read, until duplicates are judged on the whole input
    # row: rows that differ only before normalising (" l" and "L") are not copies.
    extras = list(columns) if dedupe else []
    selected = raw.select(
        **{c: out[c] for c in final_cols},
        **{f"__extra_{i}": raw[c] for i, c in enumerate(extras)},
        **({"__dropped": dropped_any} if dropped else {}),
    )
    if dropped:
        selected = selected.filter(ibis._["__dropped"] == False).drop("__dropped")  # noqa: E712
    if dedupe:
        selected = selected.distinct()
    clean = selected.select(*final_cols)
    n_repeated = 0
    if maybe_repeats and not drop:
        n_repeated = n_before_dedupe - int(clean.distinct().count().to_pyarrow().as_py())
        if n_repeated:
            warnings.append(
                f"{n_repeated:,} {'row repeats' if n_repeated == 1 else 'rows repeat'} an earlier row exactly and "
                "are kept: with no column that "
                "tells plate appearances apart (inning, outs_before, bases_before or an event number), they "
                "read as real repeats (the same batter making the same out against the same pitcher twice "
                "in a game). If the table holds copied rows, load with drop_duplicates=True (--duplicates drop "
                "on the command line)."
            )
    return _Checked(
        table=clean,
        n_read=n_read,
        n_before_dedupe=n_before_dedupe,
        dropped=dropped,
        set_missing=set_missing,
        warnings=warnings,
        n_kept=None if dedupe else n_before_dedupe,
        n_ev=counts.get("n_ev", 0),
        n_batted_no_ev=counts.get("n_batted_no_ev", 0),
        n_repeated=n_repeated,
    )


def finish_report(checked: _Checked, table: ir.Table, *, source: str = "", strict: bool = False) -> ValidationReport:
    """Count what is left in the final ``table`` and build the :class:`ValidationReport`."""
    columns = list(table.columns)
    has_ev = "exit_velo" in columns
    counts = {"n_kept": checked.n_kept, "n_ev": checked.n_ev, "n_batted_no_ev": checked.n_batted_no_ev}
    if checked.n_kept is None:
        aggs: dict[str, ir.Value] = {"n_kept": table.count()}
        if has_ev:
            aggs["n_ev"] = table.exit_velo.notnull().sum()
            aggs["n_batted_no_ev"] = (table.outcome.isin(list(BATTED)) & table.exit_velo.isnull()).sum()
        counts.update({k: int(v or 0) for k, v in table.aggregate(**aggs).to_pyarrow().to_pylist()[0].items()})
    dropped = dict(checked.dropped)
    warnings = list(checked.warnings)
    n_dup = checked.n_before_dedupe - counts["n_kept"]
    if n_dup:
        if strict:
            msg = (
                f"strict=True and the table has {_plural(n_dup, 'exact duplicate row')}. Remove them in the "
                "source, or load with strict=False to drop them with a count."
            )
            raise DataError(msg)
        dropped["duplicate row"] = n_dup
        warnings.append(
            f"{_plural(n_dup, 'exact duplicate row')} dropped. If your table has no per-plate-appearance "
            "key (an event number, or inning and outs), identical plate appearances cannot be told from "
            "copies: add such a column, or load with drop_duplicates=False."
        )
    has_contact = has_ev and "launch_angle" in columns and counts.get("n_ev", 0) > 0
    n_batted_no_ev = counts.get("n_batted_no_ev", 0)
    if has_contact and n_batted_no_ev:
        warnings.append(
            f"{_plural(n_batted_no_ev, 'batted ball')} without exit velocity (kept; contact views leave them out)."
        )
    return ValidationReport(
        n_read=checked.n_read,
        n_kept=counts["n_kept"],
        dropped=dropped,
        warnings=warnings,
        has_contact=bool(has_contact),
        has_base_out=all(c in columns for c in BASE_OUT_COLUMNS),
        set_missing=dict(checked.set_missing),
        n_batted_without_exit_velo=n_batted_no_ev if has_ev else 0,
        n_repeated_rows=checked.n_repeated,
        columns=columns,
        source=source,
    )
