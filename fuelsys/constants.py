"""Physical constants and reference states, each defined once with its source (ground floor).

Every module takes these from here; none writes the number again.

========== ========================= ===================== =============================================
name       value                     unit                  source
========== ========================= ===================== =============================================
R_MOLAR    8.314462618               J/(mol K)             CODATA 2018 (exact since the 2019 SI)
SIGMA_SB   5.670374419e-8            W/(m² K⁴)             CODATA 2018 (exact since the 2019 SI)
G0         9.80665                   m/s²                  standard gravity, 3rd CGPM (1901); ISO 80000-3
T0_C       273.15                    K                     0 °C in kelvin, SI Brochure 9th ed. (2019)
P_ATM      101325                    Pa                    standard atmosphere, 10th CGPM (1954)
P_ISA      101325                    Pa                    ISO 2533:1975 sea-level pressure (= P_ATM)
T_ISA      288.15                    K                     ISO 2533:1975 sea-level temperature
T_REF      298.15                    K                     thermochemical reference temperature
                                                           (NIST-JANAF, Chase 1998; NASA/TP-2002-211556)
P_STANDARD 1e5                       Pa                    IUPAC standard-state pressure (1 bar),
                                                           Cox, Wagman & Medvedev (1989)
========== ========================= ===================== =============================================

References
----------
.. [1] E. Tiesinga, P. J. Mohr, D. B. Newell and B. N. Taylor, "CODATA recommended
   values of the fundamental physical constants: 2018", Rev. Mod. Phys. 93 (2021) 025010.
.. [2] BIPM, "The International System of Units (SI)", 9th ed. (2019).
.. [3] ISO 2533:1975, Standard Atmosphere, Table 1 (sea level).
.. [4] M. W. Chase, "NIST-JANAF Thermochemical Tables", 4th ed., J. Phys. Chem. Ref.
   Data Monograph 9 (1998).
.. [5] J. D. Cox, D. D. Wagman and V. A. Medvedev, "CODATA Key Values for
   Thermodynamics", Hemisphere (1989): standard-state pressure 1 bar.

Examples
--------
>>> from fuelsys.constants import R_MOLAR, T0_C
>>> round(R_MOLAR * (T0_C + 25.0), 3)
2478.957
"""

#: molar gas constant [J/(mol K)] (CODATA 2018, exact)
R_MOLAR = 8.314462618
#: Stefan-Boltzmann constant [W/(m² K⁴)] (CODATA 2018, exact)
SIGMA_SB = 5.670374419e-8
#: standard acceleration of gravity [m/s²] (3rd CGPM 1901, ISO 80000-3)
G0 = 9.80665
#: 0 °C in kelvin [K] (SI Brochure, 9th ed.)
T0_C = 273.15
#: standard atmosphere [Pa] (10th CGPM 1954)
P_ATM = 101325.0
#: sea-level pressure of the ISO standard atmosphere [Pa] (ISO 2533:1975; the same value as P_ATM)
P_ISA = P_ATM
#: sea-level temperature of the ISO standard atmosphere [K] (ISO 2533:1975)
T_ISA = 288.15
#: reference temperature of enthalpies of formation and heating values [K] (NIST-JANAF, Chase 1998)
T_REF = 298.15
#: standard-state pressure [Pa] (IUPAC 1 bar; Cox, Wagman & Medvedev 1989)
P_STANDARD = 1.0e5
