"""Rallies play their shots with the chain's compiled impact and flights (``engine="compiled"``
in rallyarc.rally.rounds, for the shots played and for the aim solves); with numpy's they must
come out the same: the rallies table identical, the shot table's strings and flags equal and its
numbers within 1e-6 (plus 1e-7 of their size, for spins in rpm).

Reference: the same rallies with the numpy engine (the default) of ``rallyarc.shot.simulate``
and ``rallyarc.aim.aim_stroke``.

The compiled contact gives numpy's to the last bit on the machine these tests were written on;
the flights differ by about 1e-14 m, and the meeting search and the aim solves of the following
shots magnify that along a rally: up to about 3e-5 rpm (2.5e-8 of the spin) in the longest
rallies of this draw.
"""

from rallyarc.rally import load_patterns, play_rallies, rounds


def test_rallies_played_compiled_are_the_rallies_played_with_numpy(monkeypatch, same_rallies):
    from rallyarc.impact import compiled

    patterns = load_patterns("demo_match")
    engines = []
    chain, aim = rounds.simulate, rounds.aim_stroke

    def spy(call):
        def spied(*args, **kw):
            engines.append(kw.get("engine", "numpy"))
            return call(*args, **kw)

        return spied

    struck = []
    kernel = compiled.hit
    monkeypatch.setattr(compiled, "hit", lambda *a: struck.append(len(a[0])) or kernel(*a))
    monkeypatch.setattr(rounds, "simulate", spy(chain))
    monkeypatch.setattr(rounds, "aim_stroke", spy(aim))
    got = play_rallies(patterns, n=300, seed=1)
    assert set(engines) == {"compiled"}
    # the shots and the aims' final metrics strike with compiled.hit (the aims' iterations
    # strike inside the compiled solve, rallyarc.aim.compiled)
    assert len(struck) > 50

    def with_numpy(call):
        def numpys(*args, **kw):
            kw["engine"] = "numpy"
            return call(*args, **kw)

        return numpys

    monkeypatch.setattr(rounds, "simulate", with_numpy(chain))
    monkeypatch.setattr(rounds, "aim_stroke", with_numpy(aim))
    n_struck = len(struck)
    want = play_rallies(patterns, n=300, seed=1)
    assert len(struck) == n_struck  # numpy's contact throughout

    same_rallies(got, want, rtol=1e-7, atol=1e-6)
