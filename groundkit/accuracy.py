"""Chemical accuracy, the precision target shared by results, devices and noise thresholds (Hartree)."""

CHEMICAL_ACCURACY = 1.6e-3  # Hartree (1 kcal/mol = 1.5936 mHa); common practice, no single source
