import pytest

from groundkit.errors import ComponentError, SizeLimitError
from groundkit.sector.space import Sector, lowest_strings, sector_size


def test_sizes_and_shapes():
    assert sector_size(12, 6, 6) == 853_776  # 924^2: C(12, 6) = 924, by definition
    s = Sector(5, 3, 2)
    assert s.shape == (10, 10) and s.size == 100 and s.n_spin_orbitals == 10
    assert s.index(*lowest_strings(3, 2)) == (0, 0)
    assert s.label(0, 0) == "22a00"


def test_size_limit():
    with pytest.raises(SizeLimitError, match="853,776 determinants.*limit of 1,000"):
        Sector(12, 6, 6, max_determinants=1000)


def test_wrong_electron_count_in_a_string():
    with pytest.raises(ComponentError, match="alpha string 0b111 has not 2 electrons"):
        Sector(4, 2, 2).index(0b111, 0b11)
