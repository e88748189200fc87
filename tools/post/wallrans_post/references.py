"""Published references: skin-friction correlations, log laws and the reference tables of
tests/data (read from the files the C++ tests read). Every item carries its source."""
import os
from pathlib import Path

import numpy as np

from .cli import InputError
from .tables import read_table

HERE = Path(__file__).resolve().parent


def data_dir():
    """The reference-data folder: $WALLRANS_DATA_DIR, tests/data of the source tree, or the
    installed copy (share/wallrans/data)."""
    candidates = [
        os.environ.get("WALLRANS_DATA_DIR"),
        HERE.parents[2] / "tests" / "data",
        HERE.parents[1] / "data",
    ]
    for candidate in candidates:
        if candidate and (Path(candidate) / "channel-mkm1999").is_dir():
            return Path(candidate)
    raise InputError(
        "reference data not found (tests/data of the source tree, share/wallrans/data of "
        "an installation, or set WALLRANS_DATA_DIR)"
    )


# --- skin-friction correlations -------------------------------------------------------------------


class Correlation:
    """Cf as a function of one Reynolds number, with its formula text and source."""

    def __init__(self, key, short, formula, source, variable, function):
        self.key, self.short, self.formula, self.source = key, short, formula, source
        self.variable, self._function = variable, function

    def __call__(self, reynolds):
        return self._function(np.asarray(reynolds, dtype=float))

    def legend(self):
        return f"{self.short}: {self.formula}"


def _blasius(re_x):
    return 2.0 * blasius_wall_curvature() / np.sqrt(re_x)


PLATE_CORRELATIONS = {
    "white": Correlation(
        "white",
        "White (2006)",
        "Cf = 0.455 / ln^2(0.06 Re_x)",
        "White, Viscous Fluid Flow, 3rd ed., McGraw-Hill 2006; the turbulent flat-plate "
        "formula also used by the NASA Turbulence Modeling Resource",
        "Re_x",
        lambda r: 0.455 / np.log(0.06 * r) ** 2,
    ),
    "power-law": Correlation(
        "power-law",
        "1/5-power law (Schlichting)",
        "Cf = 0.0592 Re_x^(-1/5)",
        "Prandtl's 1/7-power-law plate as given by Schlichting, Boundary-Layer Theory; "
        "tabulated by the NASA Turbulence Modeling Resource",
        "Re_x",
        lambda r: 0.0592 * r**-0.2,
    ),
    "blasius": Correlation(
        "blasius",
        "Blasius (1908)",
        "Cf = 2 f''(0) / sqrt(Re_x) = 0.6641 / sqrt(Re_x)",
        "laminar, Blasius (1908); f''(0) from Ganapol (2010), arXiv:1006.3888, Table 3b",
        "Re_x",
        _blasius,
    ),
}

DEAN_CHANNEL = Correlation(
    "dean",
    "Dean (1978)",
    "Cf = 0.073 Re_b^(-1/4), Re_b = 2 h U_b / nu",
    "Dean (1978), J. Fluids Eng. 100(2):215-223",
    "Re_b",
    lambda r: 0.073 * r**-0.25,
)

COLES_FERNHOLZ = Correlation(
    "coles-fernholz",
    "Coles-Fernholz (Nagib, Chauhan & Monkewitz 2007)",
    "Cf = 2 [ln(Re_theta)/0.384 + 4.127]^-2",
    "Coles-Fernholz relation, constants of Nagib, Chauhan & Monkewitz (2007), "
    "Phil. Trans. R. Soc. A 365:755",
    "Re_theta",
    lambda r: 2.0 / (np.log(r) / 0.384 + 4.127) ** 2,
)

KARMAN_SCHOENHERR = Correlation(
    "karman-schoenherr",
    "Karman-Schoenherr (Schoenherr 1932)",
    "Cf = 1 / (17.08 L^2 + 25.11 L + 6.012), L = log10(Re_theta)",
    "Karman-Schoenherr (Schoenherr 1932) in the form of the NASA Turbulence " "Modeling Resource",
    "Re_theta",
    lambda r: 1.0 / (17.08 * np.log10(r) ** 2 + 25.11 * np.log10(r) + 6.012),
)

# --- log laws -------------------------------------------------------------------------------------

LOG_LAW = {
    "kappa": 0.41,
    "b": 5.0,
    "short": "log law kappa = 0.41, B = 5.0 (White 1974)",
    "source": "kappa = 0.41, B = 5.0: White (1974), Viscous Fluid Flow, the values the NASA "
    "Turbulence Modeling Resource plots",
}

# The band of published log laws of tests/verification/log_law_band.hpp: White (1974); Spalding (1961,
# J. Appl. Mech. 28:455); Lee & Moser (2015, J. Fluid Mech. 774:395, channel fit; from memory).
PUBLISHED_LOG_LAWS = ((0.41, 5.0), (0.40, 5.5), (0.384, 4.27))
LOG_LAW_BAND_SOURCE = (
    "band of published log laws: kappa, B = 0.41, 5.0 (White 1974); 0.40, 5.5 (Spalding "
    "1961); 0.384, 4.27 (Lee & Moser 2015, from memory)"
)


def log_law(y_plus, kappa=LOG_LAW["kappa"], b=LOG_LAW["b"]):
    return np.log(y_plus) / kappa + b


def log_law_band(y_plus):
    """(lowest, highest) U+ of the published log laws at y+."""
    values = np.array([np.log(y_plus) / kappa + b for kappa, b in PUBLISHED_LOG_LAWS])
    return values.min(axis=0), values.max(axis=0)


# Coles' wake parameter of the channel (Dean 1978, with kappa = 0.41), as in test_channel.cpp.
CHANNEL_WAKE_PI = 0.14

# --- reference tables (tests/data) ------------------------------------------------------------------

MKM_SOURCE = "DNS of Moser, Kim & Mansour (1999), Phys. Fluids 11:943"
MKM_CASES = (("180", 178.12), ("395", 392.24), ("590", 587.19))


class ChannelDns:
    """One mean-profile table of Moser, Kim & Mansour (1999)."""

    def __init__(self, label, re_tau):
        self.label, self.re_tau = label, re_tau
        self.path = data_dir() / "channel-mkm1999" / f"mkm_retau{label}_means.dat"
        table = read_table(self.path)
        self.y_over_h, self.y_plus, self.u_plus = table["y/h"], table["y+"], table["U+"]

    def bulk_u_plus(self):
        """Bulk U+ by the trapezoidal rule over the table (as the data README does)."""
        return float(np.trapz(self.u_plus, self.y_over_h))

    def legend(self):
        return f"DNS Moser, Kim & Mansour (1999), Re_tau = {self.re_tau:g}"


def nearest_channel_dns(re_tau):
    """The MKM table whose Re_tau is nearest to re_tau (relative distance)."""
    label, actual = min(MKM_CASES, key=lambda case: abs(np.log(case[1] / re_tau)))
    return ChannelDns(label, actual)


def blasius_table():
    """Ganapol (2010) Table 3b: eta, f, f', f''."""
    return read_table(data_dir() / "blasius-ganapol2010" / "blasius_ganapol2010.dat")


def blasius_wall_curvature():
    """f''(0) of the Blasius solution, from the first row of the table."""
    table = blasius_table()
    return float(table["f''"][np.argmin(table["eta"])])


BLASIUS_SOURCE = "Blasius (1908); table of Ganapol (2010), arXiv:1006.3888, Table 3b"
GHIA_SOURCE = "Ghia, Ghia & Shin (1982), J. Comput. Phys. 48:387, Tables I-II"
GHIA_COLUMNS = {100: "u(Re=100)", 400: "u(Re=400)", 1000: "u(Re=1000)"}


def ghia_tables():
    """(Table I: y and u on x = 0.5, Table II: x and v on y = 0.5)."""
    folder = data_dir() / "lid-driven-cavity-ghia1982"
    return (
        read_table(folder / "ghia1982_u_vertical_centerline.dat"),
        read_table(folder / "ghia1982_v_horizontal_centerline.dat"),
    )


SCHLATTER_ORLU_SHORT = "DNS Schlatter & Orlu (2010), ZPG boundary layer, Re_theta = 4061"
SCHLATTER_ORLU_SOURCE = "DNS of Schlatter & Orlu (2010), J. Fluid Mech. 659:116, Re_theta = 4061"


def schlatter_orlu():
    """The zero-pressure-gradient boundary-layer profile at Re_theta = 4061 and its header values."""
    path = data_dir() / "zpg-tbl-schlatter-orlu2010" / "schlatter_orlu_retheta4060.dat"
    table = read_table(path)
    header = {}
    with open(path, encoding="utf-8") as stream:
        for line in stream:
            if line.startswith("#") and "Re_theta=" in line:
                for item in line[1:].split():
                    if "=" in item:
                        key, value = item.split("=", 1)
                        header[key] = float(value)
    if "cf" not in header or "Re_theta" not in header:
        raise InputError(f"{path}: header lacks Re_theta= and cf=")
    return table, header


def karman_schoenherr_table():
    return read_table(data_dir() / "flat-plate-correlations-tmr" / "cf_karman_schoenherr.dat")
