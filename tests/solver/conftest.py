"""Fixtures shared by the lane-kernel tests."""
import numpy as np
import pytest

from thermo.solver.kernel_arrays import KernelNetwork


@pytest.fixture
def reruns(monkeypatch):
    """The configuration indices a lane kernel hands back to the one-configuration kernel (a spy on
    ``KernelNetwork.subset``, which every rerun goes through)."""
    calls, original = [], KernelNetwork.subset

    def spy(self, index):
        calls.append(np.asarray(index, dtype=np.int64).tolist())
        return original(self, index)
    monkeypatch.setattr(KernelNetwork, "subset", spy)
    return calls
