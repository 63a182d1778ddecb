"""Properties of terms: the convolution equals brute force, weights add up, text round trips."""

from __future__ import annotations

import itertools
import math
from collections import Counter
from fractions import Fraction

from hypothesis import given
from hypothesis import strategies as st

from confspec import Configuration, ConfspecError, Term, hund_ground_term, parse_term, terms
from confspec.chemistry.terms import TERM_STYLES
from confspec.physics import pauli_limit


@st.composite
def small_configurations(draw: st.DrawFn) -> Configuration:
    """One to three open subshells (l ≤ 3) with at most ~20 000 microstates."""
    keys = draw(st.sets(st.tuples(st.integers(1, 6), st.integers(0, 3))
                        .filter(lambda k: k[1] < k[0]), min_size=1, max_size=3))
    triples = []
    budget = 20_000
    for n, l in sorted(keys):
        cap = pauli_limit(l)
        k = draw(st.integers(1, cap))
        if budget // max(math.comb(cap, k), 1) < 1:
            k = cap  # keep brute force affordable: a full subshell adds one microstate
        budget //= math.comb(cap, k)
        triples.append((n, l, k))
    return Configuration.from_occupancies(triples)


def _brute_force_terms(config: Configuration) -> Counter[tuple[int, int]]:
    """(2S+1, L) multiset by enumerating every microstate and peeling terms off."""
    table: Counter[tuple[int, int]] = Counter()
    per_subshell = []
    for sub in config.subshells:
        orbitals = [(m, s) for m in range(-sub.l, sub.l + 1) for s in (1, -1)]
        per_subshell.append([(sum(m for m, _ in c), sum(s for _, s in c))
                             for c in itertools.combinations(orbitals, sub.electrons)])
    for combo in itertools.product(*per_subshell):
        table[(sum(ml for ml, _ in combo), sum(ms for _, ms in combo))] += 1
    found: Counter[tuple[int, int]] = Counter()
    while +table:
        ms2 = max(ms for (_, ms), c in table.items() if c > 0)
        ml = max(m for (m, s), c in table.items() if c > 0 and s == ms2)
        found[(ms2 + 1, ml)] += 1
        for m in range(-ml, ml + 1):
            for s in range(-ms2, ms2 + 1, 2):
                table[(m, s)] -= 1
    assert all(c == 0 for c in table.values()), "the table did not peel into whole terms"
    return found


@given(small_configurations())
def test_convolution_equals_brute_force(config: Configuration) -> None:
    got = Counter((t.multiplicity, t.L) for t in terms(config))
    assert got == _brute_force_terms(config)


@given(small_configurations())
def test_weights_add_up_to_the_microstates(config: Configuration) -> None:
    microstates = math.prod(math.comb(pauli_limit(s.l), s.electrons) for s in config.subshells)
    assert sum(t.weight for t in terms(config)) == microstates


@given(small_configurations())
def test_hund_picks_highest_s_then_highest_l(config: Configuration) -> None:
    ground = hund_ground_term(config)
    best = max(terms(config), key=lambda t: (t.multiplicity, t.L))
    assert ground.without_j() == best
    assert ground.J in ground.allowed_j()
    assert ground.multiplicity - 1 == config.unpaired_electrons


@given(st.integers(0, 5), st.data())
def test_particle_hole_symmetry(l: int, data: st.DataObject) -> None:
    cap = pauli_limit(l)
    k = data.draw(st.integers(0, cap))
    letters = "spdfgh"
    config = Configuration.from_occupancies({f"{l + 1}{letters[l]}": k})
    mirror = Configuration.from_occupancies({f"{l + 1}{letters[l]}": cap - k})
    assert terms(config) == terms(mirror)


@st.composite
def any_terms(draw: st.DrawFn) -> Term:
    multiplicity = draw(st.integers(1, 14))
    L = draw(st.integers(0, 22))
    parity = draw(st.sampled_from(["even", "odd"]))
    S = Fraction(multiplicity - 1, 2)
    js = [abs(L - S) + i for i in range(int(L + S - abs(L - S)) + 1)]
    J = draw(st.none() | st.sampled_from(js))
    return Term(multiplicity=multiplicity, L=L, parity=parity, J=J)


@given(any_terms(), st.sampled_from(TERM_STYLES))
def test_every_style_reads_back(term: Term, style: str) -> None:
    assert parse_term(term.format(style)) == term
    assert Term.model_validate_json(term.model_dump_json()) == term
    assert Term.model_validate(str(term)) == term


TERM_ALPHABET = st.sampled_from([*"0123456789SPDFGHIJKLpdo°º*/_^{}[]<> ₀₁₂⁰¹²",
                                 "\\circ", "<sup>", "</sup>", "<sub>", "\\mathrm{"])


@given(st.text(max_size=20) | st.lists(TERM_ALPHABET, max_size=12).map("".join))
def test_parse_term_raises_only_confspec_errors(text: str) -> None:
    try:
        term = parse_term(text)
    except ConfspecError as err:
        assert err.code in ("term-syntax", "invalid-term", "empty", "too-long",
                            "number-too-large")
        if err.position is not None:
            assert 0 <= err.position <= len(text)
    else:
        assert parse_term(str(term)) == term
