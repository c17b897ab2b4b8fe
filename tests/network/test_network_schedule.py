"""Schedule: validation, piecewise-linear values, exact integrals, joining."""
import numpy as np
import pytest
from hypothesis import given, settings, strategies as st
from scipy.integrate import quad

from thermo.errors import ModelError
from thermo.network.schedule import Schedule


def ramp():
    return Schedule(np.array([0.0, 1.0, 3.0]), {"q": np.array([0.0, 10.0, 10.0]), "v": np.array([1.0, 2.0, 4.0])})


def test_value_is_linear_between_samples():
    s = ramp()
    # piecewise linear interpolation by hand: halfway along the first piece is 5
    assert s.value("q", 0.5) == pytest.approx(5.0)
    assert s.value("v", 2.0) == pytest.approx(3.0)
    np.testing.assert_allclose(s.value("q", [0.0, 0.25, 2.0, 3.0]), [0.0, 2.5, 10.0, 10.0])
    assert s.values_at(0.5) == pytest.approx({"q": 5.0, "v": 1.5})


def test_integral_exact_against_hand_and_quad():
    s = ramp()
    # by hand: triangle 0..1 gives 5, rectangle 1..3 gives 20
    assert s.integral("q", 0.0, 3.0) == pytest.approx(25.0, rel=1e-14)
    # partial pieces: from 0.5 to 2: trapezoid (5+10)/2*0.5 + 10*1 = 13.75
    assert s.integral("q", 0.5, 2.0) == pytest.approx(13.75, rel=1e-14)
    assert s.integral("q", 2.0, 0.5) == pytest.approx(-13.75, rel=1e-14)
    np.testing.assert_allclose(s.integral("q", np.array([0.0, 0.5]), np.array([1.0, 2.0])), [5.0, 13.75])


@settings(max_examples=30, deadline=None)
@given(st.lists(st.floats(-1e3, 1e3), min_size=3, max_size=12), st.floats(0, 1), st.floats(0, 1))
def test_integral_matches_scipy_quad(values, a, b):
    # reference: adaptive quadrature (scipy.integrate.quad, QUADPACK) of the interpolant
    t = np.cumsum(np.linspace(0.5, 1.5, len(values)))
    s = Schedule(t, {"x": np.array(values)})
    t0, t1 = t[0] + a * (t[-1] - t[0]), t[0] + b * (t[-1] - t[0])
    ref, _ = quad(lambda x: np.interp(x, t, values), t0, t1, points=t, limit=200)
    assert s.integral("x", t0, t1) == pytest.approx(ref, rel=1e-9, abs=1e-9)


@pytest.mark.parametrize("time, signals, words", [
    ([0.0, 1.0, 1.0], {"q": [0, 1, 2]}, "strictly increasing"),
    ([0.0, 2.0, 1.0], {"q": [0, 1, 2]}, "sample 2"),
    ([0.0, 1.0], {"q": [0, 1, 2]}, "signal 'q' has shape"),
    ([0.0, 1.0], {"speed": [0, np.nan]}, "signal 'speed' has a non-finite"),
    ([0.0], {"q": [0]}, "at least two"),
])
def test_validation_names_the_problem(time, signals, words):
    with pytest.raises(ModelError, match=words):
        Schedule(np.array(time), {k: np.array(v, dtype=float) for k, v in signals.items()})


def test_unknown_signal_and_outside_times():
    s = ramp()
    with pytest.raises(ModelError, match="no signal named 'qq'.*did you mean 'q"):
        s.value("qq", 0.5)
    with pytest.raises(ModelError, match="outside the schedule"):
        s.value("q", 3.5)
    with pytest.raises(ModelError, match="outside the schedule"):
        s.integral("q", -1.0, 1.0)


def test_arrays_are_read_only():
    s = ramp()
    with pytest.raises(ValueError):
        s.signals["q"][0] = 3.0
    with pytest.raises(ValueError):
        s.time_s[0] = 3.0


def test_shift_and_concatenate():
    a = ramp()
    # the join at t = 3 carries q = 10 from the first and q = 0 from the second: a jump, refused
    with pytest.raises(ModelError, match="signal 'q' jumps"):
        ramp().concatenate(ramp().shifted(3.0))
    # a gap is linear: integral over the joined schedule is the sum plus the gap's trapezoid
    gap = a.concatenate(ramp().shifted(5.0))
    np.testing.assert_allclose(gap.time_s, [0, 1, 3, 5, 6, 8])
    assert gap.integral("q", 0.0, 8.0) == pytest.approx(25.0 + 0.5 * (10 + 0) * 2 + 25.0)
    with pytest.raises(ModelError, match="before the first ends"):
        a.concatenate(ramp().shifted(1.0))
    with pytest.raises(ModelError, match="different signals"):
        a.concatenate(Schedule.constant(4.0, 5.0, {"q": 1.0}))


def test_concatenate_merges_equal_shared_sample():
    a = Schedule.constant(0.0, 2.0, {"q": 3.0})
    b = Schedule.constant(2.0, 5.0, {"q": 3.0})
    joined = a.concatenate(b)
    np.testing.assert_allclose(joined.time_s, [0.0, 2.0, 5.0])
    assert joined.integral("q", 0.0, 5.0) == pytest.approx(15.0)


# ---------------------------------------------------------------------- several signals at once
def _old_antiderivative(s, name, t):
    """Integral of one signal from the start to ``t`` as worked out one signal at a time before
    ``integral_columns`` (the reference the vectorised form must equal to the bit)."""
    tt, v = s.time_s, s.signals[name]
    cum = np.concatenate([[0.0], np.cumsum(0.5 * (v[1:] + v[:-1]) * np.diff(tt))])
    tc = np.clip(t, tt[0], tt[-1])
    k = np.clip(np.searchsorted(tt, tc, side="right") - 1, 0, tt.size - 2)
    return cum[k] + 0.5 * (v[k] + np.interp(tc, tt, v)) * (tc - tt[k])


def _ramps(seed):
    """A schedule of braking ramps and holds (rounded, irregular steps) and query times that hit
    samples exactly, fall between them and lie a rounding error past either end."""
    rng = np.random.default_rng(seed)
    t = 1234.5 + np.cumsum(rng.uniform(0.01, 0.3, 400))
    q = np.where(rng.random(400) < 0.4, 0.0, rng.uniform(0.0, 9e4, 400))    # switched on and off
    signals = {"q": q, "speed": np.abs(np.cumsum(rng.normal(0.0, 2.0, 400))), "air": np.full(400, 301.15),
               "r": np.interp(t, t[::25], rng.uniform(-5.0, 5.0, t[::25].size))}
    s = Schedule(t, signals)
    span = t[-1] - t[0]
    grid = np.unique(np.concatenate([t[::3], rng.uniform(t[0], t[-1], 100), [t[0], t[-1]]]))
    grid[0] -= 0.5e-9 * span            # within the rounding tolerance
    grid[-1] += 0.5e-9 * span
    return s, grid


@pytest.mark.parametrize("seed", range(4))
def test_integral_columns_equal_the_signal_by_signal_integrals_to_the_bit(seed):
    s, grid = _ramps(seed)
    mid = grid[:-1] + 0.2928932188134524 * np.diff(grid)
    names = ("q", "r", "speed")
    for t in (grid, mid, grid.reshape(-1, 2 if grid.size % 2 == 0 else 1)):
        cols = s.integral_columns(names, t)
        assert cols.shape == t.shape + (3,)
        for j, name in enumerate(names):
            np.testing.assert_array_equal(cols[..., j], _old_antiderivative(s, name, t))
    # a step's integral is the difference of two columns, as integral() gives it
    at = s.integral_columns(names, grid)
    for j, name in enumerate(names):
        np.testing.assert_array_equal(at[1:, j] - at[:-1, j], s.integral(name, grid[:-1], grid[1:]))
        np.testing.assert_array_equal(at[1:, j] - at[:-1, j],
                                      _old_antiderivative(s, name, grid[1:]) - _old_antiderivative(s, name, grid[:-1]))
    assert s.integral("q", grid[3], grid[7]) == _old_antiderivative(s, "q", grid[7]) - _old_antiderivative(s, "q", grid[3])


@pytest.mark.parametrize("seed", range(4))
def test_columns_equal_value_signal_by_signal(seed):
    s, grid = _ramps(seed)
    cols = s.columns(("air", "speed", "q"), grid)
    for j, name in enumerate(("air", "speed", "q")):
        np.testing.assert_array_equal(cols[:, j], s.value(name, grid))
        np.testing.assert_array_equal(cols[:, j], np.interp(grid, s.time_s, s.signals[name]))
    assert s.columns(("speed", "q"), grid[5]).tolist() == [s.value("speed", grid[5]), s.value("q", grid[5])]
    assert s.columns((), grid).shape == (grid.size, 0)


def test_columns_and_integral_columns_check_names_and_times():
    s = ramp()
    with pytest.raises(ModelError, match="no signal named 'qq'"):
        s.columns(("v", "qq"), [0.5])
    with pytest.raises(ModelError, match="no signal named 'qq'"):
        s.integral_columns(("qq",), [0.5])
    with pytest.raises(ModelError, match="time 3.5 s is outside"):
        s.columns(("q",), [0.5, 3.5])
    with pytest.raises(ModelError, match="time -1.0 s is outside"):
        s.integral_columns(("q", "v"), [-1.0, 1.0])
    # by hand: q's integral from 0 to 1 is the triangle 5, to 3 adds the rectangle 20; v's from 0 to 3 is 1.5 + 6
    np.testing.assert_allclose(s.integral_columns(("q", "v"), [1.0, 3.0]), [[5.0, 1.5], [25.0, 7.5]], rtol=1e-14)


def test_signals_are_copied_from_what_was_given():
    q = np.array([0.0, 10.0, 10.0])
    s = Schedule(np.array([0.0, 1.0, 3.0]), {"q": q, "v": [1, 2, 4]})
    q[0] = 7.0
    assert s.signals["q"][0] == 0.0 and s.signals["v"].dtype == float
    assert s.integral("q", 0.0, 3.0) == pytest.approx(25.0)


def test_integral_broadcasts_its_limits():
    s = ramp()
    # by hand: from 0 to 1, 2, 3: 5, 15, 25; a scalar start against an array of ends and back
    np.testing.assert_allclose(s.integral("q", 0.0, np.array([1.0, 2.0, 3.0])), [5.0, 15.0, 25.0], rtol=1e-14)
    np.testing.assert_allclose(s.integral("q", np.array([[1.0], [2.0]]), 3.0), [[20.0], [10.0]], rtol=1e-14)
    assert s.integral("q", np.array([[0.0], [1.0]]), np.array([2.0, 3.0])).shape == (2, 2)
    assert isinstance(s.integral("q", np.float64(0.5), 2), float)


def test_sample_gives_columns_and_integral_columns_together():
    s, grid = _ramps(5)
    values, integrals = s.sample(("air", "speed"), ("q", "r"), grid)
    np.testing.assert_array_equal(values, s.columns(("air", "speed"), grid))
    np.testing.assert_array_equal(integrals, s.integral_columns(("q", "r"), grid))
    assert values.shape == (grid.size, 2) and integrals.shape == (grid.size, 2)
    with pytest.raises(ModelError, match="outside"):
        s.sample((), ("q",), [grid[0] - 1.0])


def test_a_nan_time_integrates_to_nan_as_one_signal_at_a_time():
    s, _ = _ramps(6)
    t = np.array([s.t_start_s, np.nan, s.t_end_s])
    np.testing.assert_array_equal(s.integral_columns(("q",), t)[:, 0], _old_antiderivative(s, "q", t))
