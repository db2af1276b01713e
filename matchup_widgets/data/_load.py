"""Loading plate appearances from files, DataFrames or any ibis table, then validating them.

Files and DataFrames are read by an embedded, in-memory DuckDB connection owned by the
returned :class:`PlateAppearances`. The validated table is a lazy ibis expression over
the source (Parquet and DuckDB files are queried in place, a DataFrame is scanned as
Arrow without a copy); a CSV file is parsed once into an in-memory temporary table,
because re-parsing text on every query is slow. Tables from a
connection the caller owns (DuckDB, polars, a warehouse) are validated on that engine
and kept as a lazy expression, so nothing is created on the caller's side.

Input files are never written to: CSV and Parquet are read by a query, a DuckDB file is
attached read-only.
"""

from __future__ import annotations

import json
from functools import cached_property
from pathlib import Path
from typing import Any

import ibis
import ibis.expr.types as ir
import pandas as pd

from ._errors import DataError
from ._schema import OPTIONAL_COLUMNS, REQUIRED_COLUMNS
from ._validate import ValidationReport, check_table, finish_report

_CONTRACT = set(REQUIRED_COLUMNS) | set(OPTIONAL_COLUMNS)
#: The plate-appearance file inside a folder written by ``demo-data`` (beside players and teams).
_PAS_FILE = "plate_appearances.parquet"
_FILE_KINDS = {".csv": "csv", ".tsv": "csv", ".txt": "csv", ".parquet": "parquet", ".pq": "parquet",
               ".duckdb": "duckdb", ".ddb": "duckdb", ".db": "duckdb"}


class PlateAppearances:
    """Validated plate appearances: an ibis table, its validation report and helpers.

    Build one with :func:`load_pas`.

    Attributes
    ----------
    table : ibis.Table
        The validated rows, one per plate appearance, in the contract's columns.
    report : ValidationReport
        What loading found (rows read, kept, dropped per reason, warnings).
    """

    def __init__(self, table: ir.Table, report: ValidationReport) -> None:
        self.table = table
        self.report = report

    def __repr__(self) -> str:
        return f"PlateAppearances({self.report.n_kept:,} rows, seasons {self.seasons})"

    @cached_property
    def frame(self) -> pd.DataFrame:
        """The validated rows as a pandas DataFrame (materialised once, then cached).

        Whole-number columns with missing values come back as float64.
        """
        return self.table.to_pandas()

    @cached_property
    def seasons(self) -> list[int]:
        """Seasons present, sorted."""
        values = self.table.select("season").distinct().to_pyarrow().column("season").to_pylist()
        return sorted(int(v) for v in values)

    @cached_property
    def players(self) -> pd.DataFrame:
        """One row per (player, role): ``player_id, name, role, hands, pa``; see :func:`player_table`."""
        from ._players import player_table

        return player_table(self.table)


def _read_mapping(mapping: dict | str | Path | None) -> dict[str, str]:
    if mapping is None:
        return {}
    if isinstance(mapping, (str, Path)):
        path = Path(mapping)
        try:
            mapping = json.loads(path.read_text(encoding="utf-8"))
        except FileNotFoundError:
            msg = f"Mapping file {str(path)!r} does not exist. Give a JSON file holding {{their_name: our_name}}."
            raise DataError(msg) from None
        except (OSError, UnicodeDecodeError, json.JSONDecodeError) as exc:
            msg = f"Mapping file {str(path)!r} is not readable JSON ({exc}). It should hold {{their_name: our_name}}."
            raise DataError(msg) from None
    if not isinstance(mapping, dict) or not all(isinstance(k, str) and isinstance(v, str) for k, v in mapping.items()):
        msg = "A column mapping must be a dict {their_name: our_name} of strings (or a JSON file holding one)."
        raise DataError(msg)
    return dict(mapping)


def _apply_mapping(table: ir.Table, mapping: dict[str, str]) -> ir.Table:
    if not mapping:
        return table
    columns = list(table.columns)
    absent = [k for k in mapping if k not in columns]
    if absent:
        shown = ", ".join(repr(c) for c in absent[:5])
        have = ", ".join(repr(c) for c in columns[:15])
        msg = f"The mapping names column(s) {shown} that the table does not have (it has {have}). Fix the mapping's keys."
        raise DataError(msg)
    unknown = [v for v in mapping.values() if v not in _CONTRACT]
    if unknown:
        shown = ", ".join(repr(c) for c in unknown[:5])
        msg = (
            f"The mapping renames onto {shown}, which are not columns of the plate-appearance contract. "
            f"Targets must be among: {', '.join(REQUIRED_COLUMNS + OPTIONAL_COLUMNS)}."
        )
        raise DataError(msg)
    renamed = [mapping.get(c, c) for c in columns]
    clashes = sorted({c for c in renamed if renamed.count(c) > 1})
    if clashes:
        shown = ", ".join(repr(c) for c in clashes[:5])
        msg = (
            f"After the mapping, column name(s) {shown} appear twice (a mapped column and one already named so). "
            "Map only one column onto each name."
        )
        raise DataError(msg)
    # ibis rename takes {new: old}
    return table.rename({new: old for old, new in mapping.items() if new != old})


def _check_frame(df: pd.DataFrame) -> pd.DataFrame:
    """Catch DataFrames that cannot become an Arrow table, with a readable message."""
    import pyarrow as pa

    names = list(df.columns)
    if not all(isinstance(c, str) for c in names):
        bad = [repr(c) for c in names if not isinstance(c, str)][:5]
        msg = f"Column names must be text; found {', '.join(bad)}. Rename the DataFrame's columns."
        raise DataError(msg)
    dup = sorted({c for c in names if names.count(c) > 1})
    if dup:
        msg = f"Column name(s) {', '.join(repr(c) for c in dup[:5])} appear more than once. Keep one of each."
        raise DataError(msg)
    for c in names:
        col = df[c]
        if col.dtype == object:
            try:
                pa.array(col, from_pandas=True)
            except (pa.ArrowException, TypeError, ValueError, OverflowError):
                types = col.dropna().map(lambda v: type(v).__name__).value_counts()
                shown = ", ".join(f"{t} ({n} rows)" for t, n in types.head(5).items())
                msg = (
                    f"Column '{c}' mixes value types ({shown}) and cannot be read as one type. "
                    "Convert it to one type (e.g. df[col].astype(str)) before loading."
                )
                raise DataError(msg) from None
    return df


def _engine_error(what: str, exc: Exception) -> DataError:
    first = str(exc).strip().splitlines()[0] if str(exc).strip() else type(exc).__name__
    msg = f"Could not read {what}: {first}. Check that it is a readable table of plate appearances."
    return DataError(msg)


def _parquet_columns(path: Path) -> frozenset[str] | None:
    """The column names of a Parquet file (None when its footer cannot be read)."""
    import pyarrow.parquet as pq

    try:
        return frozenset(pq.read_schema(path).names)
    except Exception:  # unreadable: the engine's read reports it with its own words
        return None


def _open_file(path: Path, table: str | None) -> tuple[ir.Table, str]:
    """Read a file on a new in-memory DuckDB connection (files are only read)."""
    if not path.exists():
        msg = f"File {str(path)!r} does not exist. Give the path of a .csv, .parquet or .duckdb file."
        raise DataError(msg)
    if path.is_dir():
        parquet = sorted(path.glob("*.parquet"))
        if not parquet:
            msg = f"{str(path)!r} is a folder with no .parquet files. Give a file path."
            raise DataError(msg)
        if (path / _PAS_FILE).is_file():
            # the layout demo-data writes: the plate appearances beside the players and teams
            path = path / _PAS_FILE
        elif len({_parquet_columns(f) for f in parquet}) > 1:
            shown = ", ".join(f.name for f in parquet[:5])
            msg = (
                f"The Parquet files in folder {str(path)!r} ({shown}) do not share one set of columns, so they "
                "are not parts of one plate-appearance table. Give the path of the file that holds the plate "
                f"appearances (or name it {_PAS_FILE})."
            )
            raise DataError(msg)
        kind = "parquet"
    else:
        kind = _FILE_KINDS.get(path.suffix.lower())
        if kind is None:
            msg = f"Cannot tell the format of {str(path)!r} from its suffix; use .csv, .parquet or .duckdb."
            raise DataError(msg)
        if path.stat().st_size == 0:
            msg = f"File {str(path)!r} is empty (0 bytes). Point to a file with plate appearances, one row each."
            raise DataError(msg)
    con = ibis.duckdb.connect()
    try:
        if kind == "csv":
            # Every column as text: keys keep leading zeros and validation decides the types.
            # Text is parsed once into an in-memory table instead of on every query.
            text = con.read_csv(str(path), all_varchar=True)
            return con.create_table(ibis.util.gen_name("csv"), text, temp=True), f"CSV file {path.name}"
        if kind == "parquet":
            source = str(path / "*.parquet") if path.is_dir() else str(path)
            return con.read_parquet(source), f"Parquet file {path.name}"
        con.attach(str(path), name="source_db", read_only=True)
        names = [
            r[0]
            for r in con.raw_sql(
                "select table_name from information_schema.tables "
                "where table_catalog = 'source_db' and table_schema = 'main' order by table_name"
            ).fetchall()
        ]
    except DataError:
        raise
    except Exception as exc:  # the engine's own error types vary by version
        raise _engine_error(f"{str(path)!r}", exc) from None
    if table is None:
        if len(names) != 1:
            msg = (
                f"DuckDB file {str(path)!r} holds {len(names)} tables ({', '.join(names[:10]) or 'none'}); "
                "say which one with table=NAME (--table NAME on the command line)."
            )
            raise DataError(msg)
        table = names[0]
    elif table not in names:
        msg = f"DuckDB file {str(path)!r} has no table {table!r}; it has {', '.join(names[:10]) or 'none'}."
        raise DataError(msg)
    return con.table(table, database=("source_db", "main")), f"DuckDB file {path.name}, table {table}"


def _open(source: Any, table: str | None) -> tuple[ir.Table, str]:
    """Return the ibis table behind ``source`` and a short description of it."""
    from ibis.backends import BaseBackend

    if isinstance(source, (str, Path)):
        return _open_file(Path(source), table)
    if isinstance(source, pd.DataFrame):
        import pyarrow as pa

        df = _check_frame(source)
        con = ibis.duckdb.connect()
        try:
            # DuckDB scans the Arrow table in place: no copy of the caller's data
            con.con.register("pas_input", pa.Table.from_pandas(df, preserve_index=False))
            t = con.table("pas_input")
        except Exception as exc:
            raise _engine_error("the DataFrame", exc) from None
        return t, f"DataFrame ({len(df):,} rows)"
    if isinstance(source, ir.Table):
        return source, "ibis table"
    if isinstance(source, BaseBackend):
        if table is None:
            msg = "An ibis connection needs table=NAME to say which table holds the plate appearances."
            raise DataError(msg)
        try:
            t = source.table(table)
        except Exception as exc:
            raise _engine_error(f"table {table!r} from the {source.name} connection", exc) from None
        return t, f"{source.name} table {table}"
    msg = (
        f"Cannot load plate appearances from a {type(source).__name__}. Give a path to a .csv, .parquet "
        "or .duckdb file, a pandas DataFrame, an ibis table, or an ibis connection with table=NAME."
    )
    raise DataError(msg)


def load_pas(
    source: Any,
    *,
    mapping: dict[str, str] | str | Path | None = None,
    table: str | None = None,
    strict: bool = False,
    outcome_map: dict[str, str | None] | None = None,
    drop_duplicates: bool | None = None,
) -> PlateAppearances:
    """Load and validate a plate-appearance table.

    Parameters
    ----------
    source : str, Path, pandas.DataFrame, ibis.Table or ibis connection
        A ``.csv``, ``.parquet`` (or a folder of Parquet files) or ``.duckdb`` file;
        a DataFrame; an ibis table on any backend; or an ibis connection with ``table``.
    mapping : dict or path, optional
        ``{their_name: our_name}`` renaming the user's columns onto the contract, or
        the path of a JSON file holding that dict. The data itself is never edited.
    table : str, optional
        Table name inside a DuckDB file (optional when it holds one table) or on an
        ibis connection.
    strict : bool, default False
        Treat every drop and every repair as an error.
    outcome_map : dict, optional
        ``{raw_code: code}`` for codes outside ``OUTCOMES``; a value of ``None``
        drops those rows with a count, e.g. ``{"SAC": None, "E": "GB_OUT"}``.
    drop_duplicates : bool or None, default None
        Drop exact duplicate rows (every input column equal) with a count. None drops
        them only when the table can tell plate appearances apart (it has ``inning``,
        ``outs_before``, ``bases_before`` or a column outside the contract, such as an
        event number); otherwise identical rows are real repeats as far as anyone can
        tell (the same out against the same pitcher twice in a game), so they are kept
        and counted in ``report.n_repeated_rows`` with a warning.

    Returns
    -------
    PlateAppearances
        ``.table`` (ibis, DuckDB for files and DataFrames), ``.report``, ``.frame``,
        ``.seasons``, ``.players``.

    Raises
    ------
    DataError
        When the data cannot be used; the message names the column, the number of
        rows, up to five example values and what to do. See
        :mod:`matchup_widgets.data._validate` for what is dropped or repaired instead.

    Notes
    -----
    Parquet and DuckDB files are queried in place, so keep the file while the result is
    in use; CSV files are parsed once into memory. Nothing is ever written to the source.

    Examples
    --------
    >>> df = pd.DataFrame({
    ...     "game_id": ["g1", "g1", "g1"], "game_date": ["2031-04-02"] * 3,
    ...     "batter_id": ["b1", "b2", "b2"], "pitcher_id": ["p1"] * 3,
    ...     "batter_name": ["Ada Quill", "Bo Reed", "Bo Reed"],
    ...     "pitcher_name": ["Cy Moss"] * 3, "batter_hand": ["L", "R", "R"],
    ...     "pitcher_hand": ["R"] * 3, "outcome": ["K", "HR", "HR"]})
    >>> pas = load_pas(df)
    >>> pas.report.n_read, pas.report.n_kept, pas.report.n_repeated_rows
    (3, 3, 1)
    >>> load_pas(df.assign(inning=[1, 3, 3])).report.dropped
    {'duplicate row': 1}
    >>> pas.seasons
    [2031]
    """
    raw, description = _open(source, table)
    renamed = _apply_mapping(raw, _read_mapping(mapping))
    try:
        checked = check_table(renamed, outcome_map=outcome_map, strict=strict, drop_duplicates=drop_duplicates)
        clean = checked.table
        report = finish_report(checked, clean, source=description, strict=strict)
    except DataError:
        raise
    except Exception as exc:  # an engine error while validating: say where, never crash deep inside
        raise _engine_error(description, exc) from None
    return PlateAppearances(clean, report)


def as_table(pas: Any) -> ir.Table:
    """Return the ibis table behind ``pas`` (a PlateAppearances, ibis table or DataFrame).

    A table without ``season`` gets it from the year of ``game_date``.

    Examples
    --------
    >>> t = as_table(pd.DataFrame({"game_date": pd.to_datetime(["2031-04-02"])}))
    >>> t.season.to_pyarrow().to_pylist()
    [2031]
    """
    if isinstance(pas, PlateAppearances):
        return pas.table
    if isinstance(pas, pd.DataFrame):
        pas = ibis.memtable(pas)
    if not isinstance(pas, ir.Table):
        msg = f"Expected PlateAppearances (from load_pas) or an ibis table, got {type(pas).__name__}."
        raise TypeError(msg)
    if "season" not in pas.columns and "game_date" in pas.columns:
        pas = pas.mutate(season=pas.game_date.year().cast("int64"))
    return pas
