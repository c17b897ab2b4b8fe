"""The sparse elimination plan (symbolic LU) and the compiled stage-matrix factorisation.

Structure: the plan is checked against the elimination-graph model of Gaussian elimination
(eliminating a pivot joins all its remaining neighbours) and against the nonzero pattern of
scipy's LU of the permuted matrix. Numbers: the sparse factor and the dense fallback are checked
against numpy.linalg.solve on matrices built from random heat networks.
"""
import numpy as np
import pytest
import scipy.linalg

from thermo.solver import kernel, stage_matrix
from thermo.solver.elimination import elimination_plan

SIGMA = 5.670374419e-8   # Stefan-Boltzmann constant [W/m^2/K^4], CODATA 2018 exact value


# ----------------------------------------------------------------------------- graphs

def chain(n):
    return [(i, i + 1) for i in range(n - 1)]


def ring(n):
    return chain(n) + [(n - 1, 0)]


def complete(n):
    return [(i, j) for i in range(n) for j in range(i + 1, n)]


def random_tree(n, rng):
    """Each node i > 0 hangs on a random earlier node (a connected graph with n - 1 edges)."""
    return [(int(rng.integers(0, i)), i) for i in range(1, n)]


def random_graph(n, m_extra, rng):
    """A random tree plus m_extra random chords (some of them repeats, some given reversed)."""
    pairs = random_tree(n, rng)
    while m_extra:
        i, j = (int(x) for x in rng.integers(0, n, 2))
        if i != j:
            pairs.append((i, j))
            m_extra -= 1
    return pairs


def eliminate_reference(n, pairs, order):
    """Neighbour sets of each pivot in the elimination graph for a given order, on a dense boolean
    adjacency matrix (the elimination-graph model: D. J. Rose, "A graph-theoretic study of the
    numerical solution of sparse positive definite systems", 1972, and A. George, J. W. H. Liu,
    Computer Solution of Large Sparse Positive Definite Systems, 1981, ch. 5; # from memory).
    Also returns each pivot's degree and the minimum degree among the remaining nodes at its turn."""
    adj = np.zeros((n, n), dtype=bool)
    for i, j in pairs:
        adj[i, j] = adj[j, i] = True
    alive = np.ones(n, dtype=bool)
    sets, degrees, min_degrees, min_index = [], [], [], []
    for p in order:
        deg = (adj & alive[None, :]).sum(axis=1)
        live = np.flatnonzero(alive)
        dmin = deg[live].min()
        min_index.append(int(live[deg[live] == dmin][0]))
        nb = np.flatnonzero(adj[p] & alive)
        nb = nb[nb != p]
        sets.append(set(nb.tolist()))
        degrees.append(int(deg[p]))
        min_degrees.append(int(dmin))
        adj[np.ix_(nb, nb)] = True          # fill-in: the remaining neighbours become a clique
        adj[nb, nb] = False
        alive[p] = False
    return sets, degrees, min_degrees, min_index


def plan_sets(plan):
    return [set(plan.nbr[plan.ptr[k]:plan.ptr[k + 1]].tolist()) for k in range(plan.order.size)]


def check_plan(n, pairs):
    """Invariants every plan must meet; returns the plan."""
    plan = elimination_plan(n, pairs)
    assert plan.order.dtype == plan.ptr.dtype == plan.nbr.dtype == np.int64
    # every node pivots exactly once
    assert sorted(plan.order.tolist()) == list(range(n))
    assert plan.ptr.shape == (n + 1,) and plan.ptr[0] == 0 and plan.ptr[-1] == plan.nbr.size
    assert np.all(np.diff(plan.ptr) >= 0)
    position = np.empty(n, dtype=int)
    position[plan.order] = np.arange(n)
    sets = plan_sets(plan)
    for k, p in enumerate(plan.order):
        nb = plan.nbr[plan.ptr[k]:plan.ptr[k + 1]]
        # each pivot's neighbour list holds only nodes eliminated later, each once
        assert np.all(position[nb] > k), f"pivot {p} lists a node eliminated before it"
        assert len(set(nb.tolist())) == nb.size
    # every original coupling is in the earlier end's list (the later end's row/column is updated)
    for i, j in pairs:
        first, second = (i, j) if position[i] < position[j] else (j, i)
        assert second in sets[position[first]]
    # the lists are exactly the elimination graph's, and each pivot has minimum degree with the
    # documented tie-break (lowest index): Markowitz (1957), Tinney and Walker (1967) scheme 2
    # (# from memory)
    ref_sets, deg, dmin, first_min = eliminate_reference(n, pairs, plan.order)
    assert sets == ref_sets
    assert deg == dmin
    assert plan.order.tolist() == first_min
    return plan


def fill(plan, pairs):
    """Fill-in entries: couplings in the plan that are not in the graph."""
    edges = {frozenset(p) for p in pairs}
    return plan.nbr.size - len(edges)


# ----------------------------------------------------------------------------- structure

def test_chain_has_no_fill_and_pivots_from_an_end():
    n = 9
    plan = check_plan(n, chain(n))
    # a path is eliminated end to end (ties at degree 1 go to the lowest index), each pivot keeping
    # one later neighbour: no fill (a tree has a perfect elimination order, S. Parter, SIAM Rev. 3
    # (1961) 119-130; # from memory)
    assert plan.order.tolist() == list(range(n))
    assert fill(plan, chain(n)) == 0
    # one multiplier and one multiply-subtract per pivot with one neighbour, none for the last
    assert plan.updates == 2 * (n - 1)


def test_trees_have_no_fill():
    rng = np.random.default_rng(11)
    for n in (2, 5, 17, 40):
        pairs = random_tree(n, rng)
        plan = check_plan(n, pairs)
        # leaves first never create fill on a tree (Parter 1961, # from memory)
        assert fill(plan, pairs) == 0
    # a star: the leaves go first (degree 1), the hub last with nobody left to update
    star = [(0, j) for j in range(1, 8)]
    plan = check_plan(8, star)
    assert plan.order[-1] in (0, 7) and fill(plan, star) == 0


def test_ring_needs_fill():
    n = 9
    plan = check_plan(n, ring(n))
    # eliminating one node of a ring of m >= 4 joins its two neighbours: a ring of m - 1 with one
    # fill edge, down to the triangle (no fill): n - 3 fill edges in all (derived here)
    assert fill(plan, ring(n)) == n - 3
    assert plan.updates > elimination_plan(n, chain(n)).updates
    # n - 2 pivots with two later neighbours (2 + 4 operations), then one with one (1 + 1)
    assert plan.updates == 6 * (n - 2) + 2


def test_complete_graph_is_dense_lu():
    n = 7
    plan = check_plan(n, complete(n))
    assert np.diff(plan.ptr).tolist() == list(range(n - 1, -1, -1))
    # dense LU: sum over k of k multipliers and k^2 multiply-subtracts = (n^3 - n)/3, leading term
    # n^3/3 multiply-adds (2n^3/3 flops: Golub and Van Loan, Matrix Computations, 4th ed., sec. 3.2;
    # # from memory)
    assert plan.updates == (n ** 3 - n) // 3


def test_random_graphs_and_their_lu_pattern_from_scipy():
    rng = np.random.default_rng(5)
    for n, extra in ((6, 3), (15, 10), (30, 25), (30, 60)):
        pairs = random_graph(n, extra, rng)
        plan = check_plan(n, pairs)
        # numeric check of the symbolic plan: a symmetric, strictly diagonally dominant matrix with
        # this pattern and random values, permuted to the plan's order, factored by scipy
        # (LAPACK getrf). Strict diagonal dominance by columns means partial pivoting swaps no rows
        # (Golub and Van Loan, Matrix Computations, 4th ed., sec. 4.1.1; # from memory), so L's
        # pattern is the symbolic pattern (random values: no exact cancellation).
        M = np.zeros((n, n))
        for i, j in pairs:
            v = rng.uniform(0.5, 2.0)
            M[i, j] -= v
            M[j, i] -= v
        M[np.diag_indices(n)] = np.abs(M).sum(axis=1) + rng.uniform(0.5, 2.0, n)
        Mp = M[np.ix_(plan.order, plan.order)]
        P, Lf, _ = scipy.linalg.lu(Mp)
        assert np.array_equal(P, np.eye(n)), "no row swaps expected for a diagonally dominant matrix"
        position = np.empty(n, dtype=int)
        position[plan.order] = np.arange(n)
        for k, s in enumerate(plan_sets(plan)):
            below = set(np.flatnonzero(Lf[k + 1:, k] != 0.0) + k + 1)
            assert below == {int(position[r]) for r in s}


def test_repeated_and_reversed_pairs_and_trivial_sizes():
    # two links between one pair (conduction and radiation, say) couple the same entries
    pairs = [(0, 1), (1, 2), (2, 0), (3, 2)]
    plan = check_plan(4, pairs)
    twice = elimination_plan(4, pairs + [(1, 0), (2, 3), (0, 2)])
    for a, b in ((plan.order, twice.order), (plan.ptr, twice.ptr), (plan.nbr, twice.nbr)):
        np.testing.assert_array_equal(a, b)
    one = check_plan(1, [])
    assert one.order.tolist() == [0] and one.updates == 0
    loose = check_plan(5, [(3, 4)])             # isolated nodes pivot too, with nothing to update
    assert loose.nbr.size == 1
    as_array = elimination_plan(5, np.array([(3, 4)], dtype=np.int32))
    np.testing.assert_array_equal(as_array.order, loose.order)


@pytest.mark.parametrize("pair", [(2, 2), (0, 4), (4, 0), (-1, 1), (1, -1), (0, 10)])
def test_bad_pairs_raise(pair):
    with pytest.raises(ValueError, match=r"bad node pair"):
        elimination_plan(4, [(0, 1), pair])


# ----------------------------------------------------------------------------- numbers

def random_links(rng, n, n_chords, n_boundary, radiation=()):
    """Random heat network: (link_a, link_b, dfa, dfb). Conduction g on a random tree plus chords
    (dF/dT_a = g, dF/dT_b = -g), boundary links b >= n, and radiation links (a, b, Ta, Tb) with
    F = c (Ta^4 - Tb^4), dF/dTa = 4 c Ta^3, dF/dTb = -4 c Tb^3 (asymmetric)."""
    pairs = random_graph(n, n_chords, rng)
    a, b, dfa, dfb = [], [], [], []
    for i, j in pairs:
        if rng.random() < 0.5:
            i, j = j, i
        g = rng.uniform(0.2, 30.0)
        a.append(i), b.append(j), dfa.append(g), dfb.append(-g)
    for _ in range(n_boundary):
        g = rng.uniform(0.1, 10.0)
        a.append(int(rng.integers(0, n))), b.append(n + int(rng.integers(0, 3))), dfa.append(g), dfb.append(-g)
    for i, j, ta, tb in radiation:
        c = SIGMA * 0.8 * 0.02          # emissivity 0.8 x area 0.02 m^2 (invented)
        a.append(i), b.append(j), dfa.append(4 * c * ta ** 3), dfb.append(-4 * c * tb ** 3)
    as_i = lambda x: np.asarray(x, dtype=np.int64)
    return as_i(a), as_i(b), np.asarray(dfa, dtype=float), np.asarray(dfb, dtype=float)


def reference_matrix(C, coef, n, link_a, link_b, dfa, dfb):
    """diag(C) - coef D J with D the (n, L) incidence matrix of the net inflow (-1 at a link's first
    end, +1 at its second) and J (L, n) the flow slopes: dr/dT = D dF/dT, written with numpy."""
    L = link_a.size
    D = np.zeros((n, L))
    J = np.zeros((L, n))
    for l in range(L):
        D[link_a[l], l] = -1.0
        J[l, link_a[l]] = dfa[l]
        if link_b[l] < n:
            D[link_b[l], l] = 1.0
            J[l, link_b[l]] = dfb[l]
    return np.diag(C) - coef * D @ J


def factor_and_solve(C, coef, n, link_a, link_b, dfa, dfb, rhs):
    plan = elimination_plan(n, [(x, y) for x, y in zip(link_a, link_b) if y < n])
    A = np.empty((n, n))
    piv = np.zeros(n, dtype=np.int64)
    mode = stage_matrix._factor(A, C, float(coef), n, link_a, link_b, dfa, dfb, plan.order, plan.ptr, plan.nbr, piv)
    x = rhs.copy()
    if mode != stage_matrix.FACTOR_FAILED:
        stage_matrix._solve(mode, A, piv, plan.order, plan.ptr, plan.nbr, x)
    return mode, x, A, plan


def rel_err(x, ref):
    return np.linalg.norm(x - ref) / np.linalg.norm(ref)


def test_newton_matrix_is_capacity_minus_scaled_flow_jacobian():
    rng = np.random.default_rng(2)
    n = 12
    la, lb, dfa, dfb = random_links(rng, n, 6, 5, radiation=[(0, 3, 450.0, 900.0)])
    C = rng.uniform(20.0, 4000.0, n)
    A = np.full((n, n), np.nan)                 # every entry must be written
    stage_matrix._newton_matrix(A, C, 0.3, n, la, lb, dfa, dfb)
    np.testing.assert_allclose(A, reference_matrix(C, 0.3, n, la, lb, dfa, dfb), rtol=1e-14, atol=1e-12)
    # energy conservation of node-to-node links: every column of D sums to zero, so with no
    # boundary links the column sums of A are the capacities (first law)
    inner = lb < n
    A2 = np.empty((n, n))
    stage_matrix._newton_matrix(A2, C, 0.3, n, la[inner], lb[inner], dfa[inner], dfb[inner])
    np.testing.assert_allclose(A2.sum(axis=0), C, rtol=1e-12)


def test_sparse_factor_solves_like_numpy_on_random_networks():
    rng = np.random.default_rng(7)
    cases = 0
    for n, chords, nbound in ((2, 0, 1), (5, 2, 2), (12, 4, 6), (25, 15, 8), (40, 40, 10)):
        for _ in range(4):
            i, j = (int(x) for x in rng.choice(n, 2, replace=False))
            rad = [(i, j, rng.uniform(300.0, 1100.0), rng.uniform(300.0, 1100.0))]
            la, lb, dfa, dfb = random_links(rng, n, chords, nbound, radiation=rad)
            assert dfa[-1] != -dfb[-1], "the radiation link must be asymmetric"
            C = rng.uniform(20.0, 4000.0, n)
            coef = rng.uniform(0.05, 2.0) * kernel.D_WEIGHT       # h d of a TR-BDF2 stage
            rhs = rng.normal(0.0, 1e3, n)
            mode, x, A, plan = factor_and_solve(C, coef, n, la, lb, dfa, dfb, rhs)
            assert mode == stage_matrix.FACTOR_SPARSE
            Aref = reference_matrix(C, coef, n, la, lb, dfa, dfb)
            # reference library: numpy.linalg.solve (LAPACK gesv)
            assert rel_err(x, np.linalg.solve(Aref, rhs)) < 1e-12
            assert np.linalg.norm(Aref @ x - rhs) < 1e-12 * np.linalg.norm(Aref) * np.linalg.norm(x)
            cases += 1
            # the factors themselves against scipy's LU of the permuted matrix: every column is
            # strictly diagonally dominant (a link adds as much to a column's diagonal as it puts
            # off the diagonal, a boundary link only adds; C > 0), so partial pivoting swaps no rows (Golub and Van Loan, 4th ed., sec. 4.1.1; # from memory)
            Ap = Aref[np.ix_(plan.order, plan.order)]
            P, Lf, Uf = scipy.linalg.lu(Ap)
            assert np.array_equal(P, np.eye(n))
            mine = A[np.ix_(plan.order, plan.order)]
            np.testing.assert_allclose(np.tril(mine, -1), np.tril(Lf, -1), rtol=1e-10, atol=1e-13)
            # the sparse factorisation leaves the reciprocal pivots on the diagonal (the solve multiplies)
            np.testing.assert_allclose(1.0 / np.diag(mine), np.diag(Uf), rtol=1e-10)
            np.testing.assert_allclose(np.triu(mine, 1), np.triu(Uf, 1), rtol=1e-10, atol=1e-10 * np.abs(Uf).max())
    assert cases == 20


def test_a_ring_with_a_tail_factors_with_fill():
    # a ring of 5 with a tail and a boundary at each end (the shape of a corner network with one
    # cycle): the plan has fill, the numbers still match
    n = 7
    pairs = ring(5) + [(4, 5), (5, 6)]
    la = np.array([p[0] for p in pairs] + [0, 6], dtype=np.int64)
    lb = np.array([p[1] for p in pairs] + [n, n + 1], dtype=np.int64)
    g = np.linspace(1.0, 9.0, la.size)
    mode, x, _, plan = factor_and_solve(np.linspace(100.0, 700.0, n), 0.4, n, la, lb, g, -g, np.arange(1.0, n + 1))
    assert fill(plan, pairs) > 0 and mode == stage_matrix.FACTOR_SPARSE
    Aref = reference_matrix(np.linspace(100.0, 700.0, n), 0.4, n, la, lb, g, -g)
    assert rel_err(x, np.linalg.solve(Aref, np.arange(1.0, n + 1))) < 1e-12     # numpy reference


def weak_chain(pivot_share):
    """Three nodes in a chain (0-1-2) with C0 = 8 J/K, coef = 1, g01 = 2 W/K and a boundary link at
    node 0 whose slope dF/dT_a is negative (a convection G(T) falling steeply with T): the first
    pivot (node 0, the lowest-index end) is A00 = 8 + 2 + s = pivot_share * C0."""
    C = np.array([8.0, 30.0, 20.0])
    s = pivot_share * 8.0 - 10.0
    la = np.array([0, 1, 0], dtype=np.int64)
    lb = np.array([1, 2, 3], dtype=np.int64)
    dfa = np.array([2.0, 5.0, s])
    dfb = np.array([-2.0, -5.0, 0.0])
    return C, 1.0, 3, la, lb, dfa, dfb


@pytest.mark.parametrize("share, expected", [
    (0.6, stage_matrix.FACTOR_SPARSE),    # weakened but still above half the capacity
    (0.5, stage_matrix.FACTOR_DENSE),     # "not > 0.5 C": exactly half falls back
    (0.1, stage_matrix.FACTOR_DENSE),     # A00 = 0.8 < |A10| = 2: partial pivoting swaps rows
    (-0.4, stage_matrix.FACTOR_DENSE),    # a negative pivot
])
def test_weak_pivot_falls_back_to_dense_lu(share, expected):
    C, coef, n, la, lb, dfa, dfb = weak_chain(share)
    plan = elimination_plan(n, [(0, 1), (1, 2)])
    assert plan.order[0] == 0, "node 0 must pivot first for this case to test the weak pivot"
    rhs = np.array([3.0, -1.0, 2.0])
    mode, x, _, _ = factor_and_solve(C, coef, n, la, lb, dfa, dfb, rhs)
    assert mode == expected
    Aref = reference_matrix(C, coef, n, la, lb, dfa, dfb)
    assert Aref[0, 0] == pytest.approx(share * 8.0)
    assert rel_err(x, np.linalg.solve(Aref, rhs)) < 1e-12      # numpy.linalg.solve reference


def test_dense_fallback_on_a_larger_network_with_a_weak_node():
    rng = np.random.default_rng(3)
    n = 20
    la, lb, dfa, dfb = random_links(rng, n, 12, 4)
    C = rng.uniform(50.0, 500.0, n)
    coef = 0.5
    # one more boundary link on node 7 with a negative slope that leaves its diagonal at 0.2 C
    Aref0 = reference_matrix(C, coef, n, la, lb, dfa, dfb)
    s = (0.2 * C[7] - Aref0[7, 7]) / coef
    la, lb = np.append(la, 7), np.append(lb, n)
    dfa, dfb = np.append(dfa, s), np.append(dfb, 0.0)
    rhs = rng.normal(0.0, 50.0, n)
    mode, x, _, _ = factor_and_solve(C, coef, n, la, lb, dfa, dfb, rhs)
    Aref = reference_matrix(C, coef, n, la, lb, dfa, dfb)
    assert Aref[7, 7] == pytest.approx(0.2 * C[7])
    # node 7's pivot can only fall further as its neighbours are eliminated (each update subtracts
    # a positive product in this M-matrix-like pattern), so the sparse factor must refuse it
    assert mode == stage_matrix.FACTOR_DENSE
    assert rel_err(x, np.linalg.solve(Aref, rhs)) < 1e-12      # numpy.linalg.solve reference


def test_singular_and_non_finite_matrices_fail():
    # two nodes without heat capacity joined by one conductance: A = coef g [[1, -1], [-1, 1]],
    # singular (the floating network's constant mode); powers of two make the zero pivot exact
    la, lb = np.array([0], dtype=np.int64), np.array([1], dtype=np.int64)
    mode, _, _, _ = factor_and_solve(np.zeros(2), 1.0, 2, la, lb, np.array([2.0]), np.array([-2.0]), np.ones(2))
    assert mode == stage_matrix.FACTOR_FAILED
    assert np.linalg.matrix_rank(reference_matrix(np.zeros(2), 1.0, 2, la, lb, [2.0], [-2.0])) == 1  # numpy
    # a node without capacity and without links: a zero row and column
    la, lb = np.array([0], dtype=np.int64), np.array([3], dtype=np.int64)
    mode, _, _, _ = factor_and_solve(np.array([5.0, 0.0, 4.0]), 1.0, 3, la, lb, np.array([1.0]),
                                     np.array([-1.0]), np.ones(3))
    assert mode == stage_matrix.FACTOR_FAILED
    # a non-finite slope (a NaN from a broken table) is refused by both factorisations
    la, lb = np.array([0, 1], dtype=np.int64), np.array([1, 2], dtype=np.int64)
    mode, _, _, _ = factor_and_solve(np.ones(2), 1.0, 2, la, lb, np.array([np.nan, 1.0]),
                                     np.array([-1.0, -1.0]), np.ones(2))
    assert mode == stage_matrix.FACTOR_FAILED
