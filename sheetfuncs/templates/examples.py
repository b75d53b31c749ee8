"""Invented example data of the templates: scenarios of our own, numbers made up.

Each template ships with example data in its block so that it shows results at once; every
sheet that shows them says they are invented. None of these numbers comes from a real product.
"""

from __future__ import annotations

from .layout import Block

__all__ = ["MEASUREMENTS", "LOTS", "PILOT", "SUMMARY"]

#: Invented: seal strength (N/15 mm) of pouches from the five sealing jaws of a packaging line,
#: eight pouches per jaw; one pouch of jaw 3 was not tested (its cell is blank).
MEASUREMENTS = Block("Measurements", "MeasurementsTable",
                     ("Jaw 1", "Jaw 2", "Jaw 3", "Jaw 4", "Jaw 5"), 30, (
    (21.4, 22.05, 21.6, 21.63, 20.55),
    (21.87, 22.55, 21.63, 21.63, 20.19),
    (21.73, 22.09, 21.17, 21.77, 20.74),
    (21.73, 22.32, 21.48, 21.57, 20.69),
    (22.13, 21.24, 21.5, 22.24, 20.89),
    (20.86, 22.17, 21.05, 21.18, 20.56),
    (21.12, 21.69, 20.98, 22.27, 20.84),
    (20.81, 22.9, None, 21.62, 21.62),
))

#: Invented: assay (% of the assigned value) of eight lots of a calibration material, three
#: replicate results per lot.
LOTS = Block("Lots", "LotsTable",
             ("Lot A11", "Lot A12", "Lot A13", "Lot A14", "Lot B01", "Lot B02", "Lot B03",
              "Lot B04"), 12, (
    (99.7, 100.17, 99.8, 100.54, 99.94, 100.51, 100.27, 99.8),
    (99.46, 100.35, 99.42, 100.3, 99.56, 100.37, 100.56, 99.95),
    (99.84, 100.35, 99.81, 100.51, 100.01, 100.39, 100.05, 99.57),
))

#: Invented: pilot hardness readings (Shore A) of gaskets cured in four zones of a cure oven,
#: five gaskets per zone.
PILOT = Block("Measurements", "MeasurementsTable",
              ("Zone 1", "Zone 2", "Zone 3", "Zone 4"), 20, (
    (60.4, 61.6, 62.6, 63.2),
    (61.1, 63.2, 61.6, 63.7),
    (62.4, 63.3, 62.0, 63.7),
    (62.5, 63.5, 60.3, 63.6),
    (60.5, 64.2, 60.2, 63.8),
))

#: Invented: tensile strength (MPa) of a packaging film from four suppliers, as each supplier's
#: certificate summarises it: number of test pieces, mean and SD.
SUMMARY = Block("GroupSummary", "GroupSummaryTable", ("Group", "n", "Mean", "SD"), 10, (
    ("Supplier North", 12, 48.6, 2.1),
    ("Supplier East", 10, 50.3, 2.6),
    ("Supplier South", 15, 47.9, 1.8),
    ("Supplier West", 8, 49.1, 3.0),
), cells=True)
