"""The confspec demo: three collaborators' tables merged into one clean SQLite database.

An invented scenario: a small spectroscopy group merges the ground-configuration tables that
three collaborators kept in their own ways (``examples/data``; regenerate them with
``examples/make_demo_data.py``). The demo

1. merges the three tables into one CSV (the group's own little script, below),
2. runs ``confspec check`` on it and shows the summary,
3. runs ``confspec normalize`` with the repairs into a new SQLite database,
4. queries that database with the SQL functions of ``confspec.sql``.

Run from the repository root: ``make demo`` (or ``python examples/demo.py``). Outputs go to
``examples/build/`` (not committed).
"""

from __future__ import annotations

import csv
import json
import shlex
import sqlite3
import subprocess
import sys
from pathlib import Path

from confspec.sql import register

ROOT = Path(__file__).resolve().parent.parent
DATA = Path("examples/data")
BUILD = Path("examples/build")


def merge() -> Path:
    """The group's merge script: one table with the source of every row."""
    rows: list[tuple[str, str, str, str]] = []
    with open(ROOT / DATA / "aster_lab.csv", encoding="utf-8", newline="") as handle:
        for record in csv.DictReader(handle):
            rows.append(("aster", record["id"], record["species"], record["config"]))
    with open(ROOT / DATA / "birch_group.tsv", encoding="utf-8", newline="") as handle:
        for number, record in enumerate(csv.DictReader(handle, dialect="excel-tab"), 1):
            rows.append(("birch", f"B{number:03d}", record["ion"],
                         record["electron configuration"]))
    with open(ROOT / DATA / "cedar_team.jsonl", encoding="utf-8") as handle:
        for number, line in enumerate(handle, 1):
            record = json.loads(line)
            rows.append(("cedar", f"C{number:03d}", record["species"], record["configuration"]))
    (ROOT / BUILD).mkdir(exist_ok=True)
    merged = BUILD / "merged.csv"
    with open(ROOT / merged, "w", encoding="utf-8", newline="") as handle:
        writer = csv.writer(handle, lineterminator="\n")
        writer.writerow(["source", "source_row", "species", "configuration"])
        writer.writerows(rows)
    counts = {name: sum(1 for r in rows if r[0] == name) for name in ("aster", "birch", "cedar")}
    print(f"merged {len(rows)} rows: aster_lab.csv {counts['aster']}, birch_group.tsv "
          f"{counts['birch']}, cedar_team.jsonl {counts['cedar']}  ->  {merged}")
    return merged


def confspec(*args: str) -> int:
    """Run the real command line, echoing it first."""
    print(f"\n$ confspec {shlex.join(args)}")
    sys.stdout.flush()
    done = subprocess.run([sys.executable, "-m", "confspec.cli", *args], cwd=ROOT, check=False)
    return done.returncode


def query(con: sqlite3.Connection, title: str, sql: str) -> None:
    print(f"\n-- {title}\n{sql}")
    cursor = con.execute(sql)
    names = [d[0] for d in cursor.description]
    rows = cursor.fetchall()
    widths = [max(len(str(v)) for v in [name, *[r[i] for r in rows]])
              for i, name in enumerate(names)]
    print("   " + "  ".join(f"{n:<{w}}" for n, w in zip(names, widths, strict=True)))
    for row in rows:
        print("   " + "  ".join(f"{'NULL' if v is None else v!s:<{w}}"
                               for v, w in zip(row, widths, strict=True)))


def main() -> int:
    print("confspec demo: three collaborators' configuration tables -> one clean database")
    merged = merge()
    database = BUILD / "atoms.db"

    status = confspec("check", str(merged), "--column", "configuration",
                      "--species-column", "species", "--report", str(BUILD / "report.csv"),
                      "--examples", "2", "--overwrite")
    if status == 2:
        return status
    status = confspec("normalize", str(merged), "--column", "configuration",
                      "--species-column", "species", "--repair-text", "--accept-uppercase",
                      "--fill-core", "--output", f"sqlite:///{database}", "--output-table",
                      "configurations", "--keep-original", "original", "--overwrite",
                      "--examples", "0")
    if status == 2:
        return status

    con = sqlite3.connect(ROOT / database)
    register(con)
    print(f"\nquerying {database} with the SQL functions of confspec.sql.register(connection):")
    query(con, "the merged table now",
          "SELECT status, count(*) AS rows, count(fixes) AS repaired,\n"
          "       count(DISTINCT original) AS spellings, count(DISTINCT configuration) AS values_\n"
          "FROM configurations GROUP BY status")
    favourite = con.execute(
        "SELECT configuration FROM configurations WHERE status = 'ok' GROUP BY configuration "
        "ORDER BY count(DISTINCT original) DESC, configuration LIMIT 1").fetchone()[0]
    query(con, f"one value, many spellings: each row below now reads {favourite!r}",
          "SELECT original, group_concat(DISTINCT species) AS species, count(*) AS rows\n"
          "FROM configurations WHERE configuration = (\n"
          "  SELECT configuration FROM configurations WHERE status = 'ok' GROUP BY configuration\n"
          "  ORDER BY count(DISTINCT original) DESC, configuration LIMIT 1)\n"
          "GROUP BY original ORDER BY rows DESC, original")
    query(con, "repaired on request (--repair-text, --accept-uppercase, --fill-core)",
          "SELECT source_row, species, original, configuration, fixes,\n"
          "       confspec_electron_count(configuration) AS electrons\n"
          "FROM configurations WHERE fixes IS NOT NULL AND status = 'ok'")
    query(con, "closed shells: a noble-gas configuration is written with the core below it",
          "SELECT configuration, min(original) AS written_as, count(*) AS rows\n"
          "FROM configurations WHERE status = 'ok' AND configuration IN\n"
          "  ('1s2', '[He] 2s2 2p6', '[Ne] 3s2 3p6', '[Ar] 3d10 4s2 4p6', '[Kr] 4d10 5s2 5p6')\n"
          "GROUP BY configuration ORDER BY confspec_electron_count(configuration)")
    query(con, "cells that are not configurations at all",
          "SELECT source_row, species, configuration, confspec_error_code(configuration) AS code\n"
          "FROM configurations WHERE NOT confspec_is_valid(configuration) LIMIT 4")
    con.close()
    print(f"\nfull per-row report: {BUILD / 'report.csv'}; clean database: {database}")
    return 0


if __name__ == "__main__":
    sys.exit(main())
