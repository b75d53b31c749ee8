"""Invented scenarios (numbers made up for the tests) shared by the report tests."""

from __future__ import annotations

# Invented scenarios for the Findings text (numbers made up for these tests).
CLEAR = {  # fill weight (g) of three filling lines; line B runs heavy
    "Line A": [50.1, 50.3, 49.8, 50.0, 50.2, 49.9],
    "Line B": [52.0, 52.3, 51.8, 52.1, 51.9, 52.2],
    "Line C": [50.0, 50.2, 49.9, 50.1, 50.3, 49.8],
}
NONE = {  # assay of three lots of a reference material; no lot effect
    "Lot 1": [10.1, 9.9, 10.0, 10.2, 9.8, 10.0],
    "Lot 2": [10.0, 10.1, 9.9, 10.0, 10.2, 9.8],
    "Lot 3": [9.9, 10.0, 10.1, 9.8, 10.1, 10.0],
}
UNEQUAL = {  # bore diameter (mm) from three suppliers; supplier 3 is far more variable
    "Supplier 1": [20.0, 20.1, 19.9, 20.0, 20.1, 19.9, 20.0, 20.1],
    "Supplier 2": [20.3, 20.2, 20.4, 20.3, 20.2, 20.4, 20.3, 20.2],
    "Supplier 3": [18.0, 22.5, 19.0, 23.0, 17.5, 21.0, 24.0, 16.0],
}


# invented: three groups that are the same seven values in different orders (SS between = 0);
# their centred mean is not a double, so a host's SUM/n and SUMIF/COUNT can differ in the last
# bit (LibreOffice recalculates SS between as about 1e-33)
_SEVEN = [5.9, 5.2, 5.5, 4.9, 5.8, 4.1, 5.3]
EQUAL_MEANS = {f"Head {i + 1}": _SEVEN[i:] + _SEVEN[:i] for i in range(3)}
