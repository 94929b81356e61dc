#!/usr/bin/python3
"""An independent check of foilwright's geometry chain.

Draws seeded scans of NACA 4- and 5-digit sections (its own formulas,
sampling, noise and outliers; nothing shared with the repository's Go
code), runs a built `foilwright prep FILE --units mm` on each, and compares
the section document with the truth: chord, twist, leading edge, the nodes
against the true outline, the trailing edge's kind, and whether each error
lies within the document's stated uncertainty.

    go build -o /tmp/fw ./cmd/foilwright
    /usr/bin/python3 scripts/indep/indep.py --prep /tmp/fw --seeds 1-300
    /usr/bin/python3 scripts/indep/indep.py --prep /tmp/fw --seeds 1-150 --mode sparse
    /usr/bin/python3 scripts/indep/indep.py --prep /tmp/fw --case 17 --keep /tmp/indep-17
    /usr/bin/python3 scripts/indep/indep.py --selftest

Needs Python 3 and numpy only. Not part of CI.
"""

import argparse
import json
import os
import sys
import tempfile

import numpy as np

sys.path.insert(0, os.path.dirname(os.path.abspath(__file__)))

import hidden  # noqa: E402
import naca  # noqa: E402
import outline as ol  # noqa: E402
import scan  # noqa: E402
import score  # noqa: E402
import shapes  # noqa: E402
import tejudge  # noqa: E402

HERE = os.path.relpath(os.path.abspath(__file__))


def parse_seeds(text):
    out = []
    for part in text.split(","):
        if "-" in part:
            a, b = part.split("-")
            out.extend(range(int(a), int(b) + 1))
        else:
            out.append(int(part))
    return out


def pct(a, b):
    return "%.1f %% (%d/%d)" % (100.0 * a / b, a, b) if b else "n/a"


def q(v, p):
    return float(np.percentile(v, p)) if len(v) else float("nan")


def severity(r):
    """How far beyond the wrong thresholds and the stated bounds a section is."""
    st = r.get("stated") or {"chord": 0, "twist_deg": 0, "surface": 0}
    return max(
        r["chord_err"] / score.WRONG_CHORD if r["chord_abs"] > st["chord"] else 0,
        r["twist_err"] / score.WRONG_TWIST if r["twist_err"] > st["twist_deg"] else 0,
        r["node_err"] / score.WRONG_NODE if r["node_err"] > st["surface"] else 0,
    )


def describe(spec):
    sh, sm, pl = spec["shape"], spec["sampling"], spec["placement"]
    te = sh["te"]
    if te == "cut":
        te += " x=%.3f" % sh["x_cut"]
    if te == "rounded":
        te += " r=%.4fc" % sh["radius"]
    extra = []
    if sm["graze"]:
        extra.append("graze %.2f" % sm["graze"])
    if sm["correlated"]:
        extra.append("corr %.1f/%.1f" % (sm["correlated"], sm["corr_len"]))
    if sm["outliers"]:
        extra.append("outl %.3f" % sm["outliers"])
    if sm["duplicates"]:
        extra.append("dup")
    if sm["shuffle"]:
        extra.append("shuffled")
    if pl["flip"] != "none":
        extra.append("flip " + pl["flip"])
    if spec.get("class"):
        c = spec["class"]
        kv = "".join(" %s=%s" % (k, ("%.4g" % v) if isinstance(v, float) else v) for k, v in c.items() if k not in ("class", "plane"))
        extra.append("[%s%s]" % (c["class"], kv))
    if spec.get("plane"):
        extra.append("3D tilt %.0f deg" % np.degrees(np.arccos(abs(spec["plane"]["normal"][2]))))
    return "%s%s %s, %d pts %s sigma %.2f noise %.1e c, chord %.4g %s twist %.1f %s" % (
        sh["section"],
        "" if sh["closed_thickness"] else "(open)",
        te,
        spec["points"],
        sm["law"],
        sm["sigma"],
        sm["noise"],
        pl["chord_mm"],
        spec.get("units", "mm"),
        pl["twist_deg"],
        " ".join(extra),
    )


def repro(args, r):
    extra = " --prep-args '%s'" % args.prep_args if args.prep_args else ""
    if args.planes:
        extra += " --planes %g" % args.planes
    if r.get("cls"):
        extra += " --class %s" % r["cls"]
    return "/usr/bin/python3 %s --prep %s --mode %s --case %d --keep /tmp/indep-%s-%d%s" % (
        HERE, r["prep"], r["mode"], r["seed"], r["mode"], r["seed"], extra)


def outcome(r):
    if r["rc"] != 0:
        return "exit %d" % r["rc"]
    parts = ["wrong " + r["wrong"]] if r["wrong"] else ["ok"]
    if r["te_decidable"] and not r["te_right"]:
        parts.append("TE " + r["te_got"])
    missed = [n for n, c in zip(("chord", "twist", "le", "surface"), r["covered"]) if not c]
    if missed:
        parts.append("uncovered " + "+".join(missed))
    return ", ".join(parts)


def changes(recs, base, specs):
    """Lists the cases whose outcome differs between the two binaries."""
    diff = [(a, b) for a, b in zip(recs, base) if outcome(a) != outcome(b)]
    print("cases that changed, --against -> --prep (%d):" % len(diff))
    for a, b in diff:
        print("  seed %d: %s -> %s   %s" % (a["seed"], outcome(b), outcome(a), describe(specs[(a["mode"], a["seed"])])))


def table(args, recs, specs, prep):
    n = len(recs)
    ok = [r for r in recs if r["rc"] == 0]
    well = [r for r in recs if r["well"]]
    well_ok = [r for r in well if r["rc"] == 0]
    wrong = [r for r in ok if r["wrong"]]
    print("indep: %d cases, mode %s, seeds %s%s, prep %s%s" % (n, args.mode, args.seeds, ", class " + args.cls if args.cls else "", prep, " " + args.prep_args if args.prep_args else ""))
    print()
    print("| figure | value |")
    print("| --- | --- |")
    print("| prep succeeds, all | %s |" % pct(len(ok), n))
    print("| prep succeeds, well-sampled (>= 300 good points, sigma <= 0.5, no grazing) | %s |" % pct(len(well_ok), len(well)))
    kinds = {}
    for r in wrong:
        kinds[r["wrong"]] = kinds.get(r["wrong"], 0) + 1
    kt = ", ".join("%s %d" % kv for kv in sorted(kinds.items(), key=lambda kv: -kv[1]))
    print("| wrong beyond stated uncertainty | %d of %d%s |" % (len(wrong), len(ok), " (" + kt + ")" if kt else ""))
    for name, pool in (("all", ok), ("well-sampled", well_ok)):
        if not pool:
            continue
        ce = [100 * r["chord_err"] for r in pool]
        te = [r["twist_err"] for r in pool]
        ne = [r["node_err"] for r in pool]
        le = [r["le_err"] for r in pool]
        print("| chord %% / twist deg / LE c / node c, %s, median | %.3f / %.4f / %.2e / %.2e |" % (
            name, q(ce, 50), q(te, 50), q(le, 50), q(ne, 50)))
        print("| chord %% / twist deg / LE c / node c, %s, 95th pct | %.3f / %.4f / %.2e / %.2e |" % (
            name, q(ce, 95), q(te, 95), q(le, 95), q(ne, 95)))
    dec = [r for r in ok if r["te_decidable"]]
    right = [r for r in dec if r["te_right"]]
    conf = {}
    for r, s in ((r, specs[(r["mode"], r["seed"])]) for r in dec if not r["te_right"]):
        key = "%s->%s" % (s["truth_te"], r["te_got"])
        conf[key] = conf.get(key, 0) + 1
    ct = ", ".join("%s %d" % kv for kv in sorted(conf.items(), key=lambda kv: -kv[1]))
    print("| TE kind right where decidable | %s%s; %d undecidable |" % (
        pct(len(right), len(dec)), " (" + ct + ")" if ct else "", len(ok) - len(dec)))
    dec26 = [r for r in ok if r.get("te_decidable26", r["te_decidable"])]
    print("| TE kind right where decidable, stop 26 judgement (tejudge.py; the row above is stop 23's) | %s; %d undecidable |" % (
        pct(sum(r["te_right"] for r in dec26), len(dec26)), len(ok) - len(dec26)))
    stated = [r for r in ok if r["stated"] is not None]
    cov = [pct(sum(r["covered"][i] for r in stated), len(stated)) for i in range(4)]
    print("| uncertainty covers chord / twist / LE / surface | %s |" % " / ".join(cov))
    corr = [r for r in stated if specs[(r["mode"], r["seed"])]["sampling"]["correlated"] > 0
            and specs[(r["mode"], r["seed"])]["sampling"]["noise"] > 0]
    if corr:
        cc = ["%.1f" % (100.0 * sum(r["covered"][i] for r in corr) / len(corr)) for i in range(4)]
        print("| ... of which correlated-noise cases (%d) | %s %% |" % (len(corr), " / ".join(cc)))
    if well_ok:
        sb = [r["stated"]["surface"] for r in well_ok if r["stated"]]
        print("| stated surface bound, well-sampled, median / 95th pct | %.4f / %.4f c |" % (q(sb, 50), q(sb, 95)))
    dr = [100.0 * r["good_dropped"] / r["good"] for r in ok if r["good"]]
    pl = sum(r["planted"] for r in ok)
    ca = sum(r["caught"] for r in ok)
    print("| good points dropped, median / 95th pct | %.2f / %.2f %% |" % (q(dr, 50), q(dr, 95)))
    print("| planted outliers caught | %s |" % pct(ca, pl))
    cam = [r for r in ok if specs[(r["mode"], r["seed"])]["shape"]["family"] != "sym"]
    cam = [r for r in cam if r["mirror_expected"] is not None]
    mw = [r for r in cam if r["mirrored"] != r["mirror_expected"]]
    print("| mirror flag wrong, cambered sections | %d of %d |" % (len(mw), len(cam)))
    conv = [r for r in ok if abs(r["twist_conv_err"] - r["twist_err"]) > 1e-6]
    print("| stated twist differs from the chord line's angle (convention check) | %d |" % len(conv))
    print()
    # Breakdowns.
    def breakdown(title, keyf):
        groups = {}
        for r in recs:
            groups.setdefault(keyf(specs[(r["mode"], r["seed"])], r), []).append(r)
        print("%s:" % title)
        for k in sorted(groups):
            g = groups[k]
            gok = [r for r in g if r["rc"] == 0]
            gw = [r for r in gok if r["wrong"]]
            gd = [r for r in gok if r["te_decidable"]]
            print("  %-22s %4d cases, succeed %5.1f %%, wrong %2d, TE right %5.1f %% of %d" % (
                k, len(g), 100.0 * len(gok) / len(g), len(gw),
                100.0 * sum(r["te_right"] for r in gd) / max(len(gd), 1), len(gd)))
    if args.cls:
        classes(recs, specs)
    breakdown("by trailing edge", lambda s, r: s["shape"]["te"])
    breakdown("by family", lambda s, r: s["shape"]["family"])
    breakdown("by points", lambda s, r: "<150" if s["points"] < 150 else ("<300" if s["points"] < 300 else ("<1000" if s["points"] < 1000 else ">=1000")))
    breakdown("by gap sigma", lambda s, r: "%.1f-%.1f" % (np.floor(s["sampling"]["sigma"] * 5) / 5, np.floor(s["sampling"]["sigma"] * 5) / 5 + 0.2))
    breakdown("by hazard", lambda s, r: ",".join(k for k, on in (("3D", s.get("plane") is not None), ("graze", s["sampling"]["graze"] > 0), ("corr", s["sampling"]["correlated"] > 0 and s["sampling"]["noise"] > 0), ("outliers", s["sampling"]["outliers"] > 0), ("flip", s["placement"]["flip"] != "none")) if on) or "none")
    print()
    fails = [r for r in recs if r["rc"] != 0]
    if fails:
        print("failures (%d):" % len(fails))
        msgs = {}
        for r in fails:
            m = r["error"]
            key = m.split(":", 2)[-1].strip()[:110] if ":" in m else m[:110]
            msgs.setdefault(key, []).append(r)
        for k, g in sorted(msgs.items(), key=lambda kv: -len(kv[1])):
            print("  %3d x exit %d  %s  (seeds %s)" % (len(g), g[0]["rc"], k, ",".join(str(r["seed"]) for r in g[:8])))
        print()
    worst = sorted(wrong, key=severity, reverse=True)[: args.worst]
    if worst:
        print("worst wrong cases:")
        for r in worst:
            s = specs[(r["mode"], r["seed"])]
            st = r["stated"] or {}
            print("  seed %d (%s): %s" % (r["seed"], r["wrong"], describe(s)))
            print("    chord %.3f %% (bound %.3g mm = %.3f %%), twist %.3f deg (bound %.3f), worst node %.4f c at (%.3f, %.3f) (bound %.4f), TE %s (truth %s), mirrored %s (expected %s)" % (
                100 * r["chord_err"], st.get("chord", 0), 100 * st.get("chord", 0) / s["placement"]["chord_mm"],
                r["twist_err"], st.get("twist_deg", 0), r["node_err"], r["node_at"][0], r["node_at"][1],
                st.get("surface", 0), r["te_got"], s["truth_te"], r["mirrored"], r["mirror_expected"]))
            print("    " + repro(args, r))
        print()
    tew = [r for r in ok if r["te_decidable"] and not r["te_right"]][: args.worst]
    if tew:
        print("trailing-edge kind wrong (first %d):" % len(tew))
        for r in tew:
            s = specs[(r["mode"], r["seed"])]
            print("  seed %d: got %s, truth %s (end %.5f c, scatter %.1e c): %s" % (
                r["seed"], r["te_got"], s["truth_te"], s["truth_te_size"], s["truth_scatter"], describe(s)))
            print("    " + repro(args, r))


def classes(recs, specs):
    """The per-class table: succeeds, wrong beyond the bound, coverage of
    chord/twist/LE/surface, TE kind right where decidable."""
    groups = {}
    for r in recs:
        groups.setdefault(specs[(r["mode"], r["seed"])]["class"]["class"], []).append(r)
    print("| class | cases | succeeds | wrong beyond bound | covered chord / twist / LE / surface | TE kind right | exit 2 | outliers caught | good dropped p95 |")
    print("| --- | --- | --- | --- | --- | --- | --- | --- | --- |")
    for name in hidden.CLASSES + hidden.EXTRA:
        g = groups.get(name)
        if not g:
            continue
        ok = [r for r in g if r["rc"] == 0]
        wr = [r for r in ok if r["wrong"]]
        st = [r for r in ok if r["stated"] is not None]
        cov = " / ".join("%.1f" % (100.0 * sum(r["covered"][i] for r in st) / len(st)) if st else "-" for i in range(4))
        dec = [r for r in ok if r["te_decidable"]]
        dr = [100.0 * r["good_dropped"] / r["good"] for r in ok if r["good"]]
        print("| %s | %d | %.1f %% | %d | %s %% | %s | %d | %s | %.2f %% |" % (
            name, len(g), 100.0 * len(ok) / len(g), len(wr), cov,
            pct(sum(r["te_right"] for r in dec), len(dec)), sum(1 for r in g if r["rc"] == 2),
            pct(sum(r["caught"] for r in ok), sum(r["planted"] for r in ok)), q(dr, 95)))
    print()


def main():
    ap = argparse.ArgumentParser(description=__doc__.split("\n\n")[0])
    ap.add_argument("--prep", help="a built foilwright binary (go build -o /tmp/fw ./cmd/foilwright)")
    ap.add_argument("--against", help="a second binary (a baseline build) run on the same files; prints both tables and the cases that changed")
    ap.add_argument("--prep-args", default="", help="more arguments for every prep run, e.g. \"--noise 0\" (split on blanks)")
    ap.add_argument("--planes", type=float, default=0.0, help="share of cases written in 3D, in a tilted plane (0 to 1; default 0)")
    ap.add_argument("--mode", default="normal", choices=["normal", "sparse"])
    ap.add_argument("--class", dest="cls", default="", help="a practitioner's class layered on each case (hidden.py: %s), or all (class seed mod %d; by name only: %s; new25: class seed mod %d of %s; new26: class seed mod %d of %s)" % (", ".join(hidden.CLASSES), len(hidden.CLASSES), ", ".join(hidden.EXTRA), len(hidden.EXTRA25), ", ".join(hidden.EXTRA25), len(hidden.EXTRA26), ", ".join(hidden.EXTRA26)))
    ap.add_argument("--seeds", default="1-300", help="seeds, e.g. 1-300 or 3,7,9")
    ap.add_argument("--case", type=int, help="run one seed and print everything about it")
    ap.add_argument("--keep", help="keep the point files and section documents in this folder")
    ap.add_argument("--records", help="write every record as a JSON line to this file")
    ap.add_argument("--worst", type=int, default=12, help="how many worst cases to list")
    ap.add_argument("--selftest", action="store_true", help="check the generator's formulas and conventions, run nothing")
    ap.add_argument("--table", metavar="RECORDS", help="print the table of a --records file (of a run in progress too), run nothing")
    args = ap.parse_args()
    if args.table:
        recs, specs = [], {}
        with open(args.table) as f:
            for line in f:
                try:
                    d = json.loads(line)
                except ValueError:
                    break  # a line being written
                recs.append(d["record"])
                specs[(d["record"]["mode"], d["record"]["seed"])] = d["spec"]
        args.mode = recs[0]["mode"] if recs else args.mode
        args.cls = args.cls or ("all" if recs and recs[0].get("cls") else "")
        args.seeds = "%s (%d records)" % (args.table, len(recs))
        table(args, recs, specs, recs[0]["prep"] if recs else "")
        return
    if args.selftest:
        bad = naca.selftest() + shapes.selftest() + hidden.selftest() + conventions_selftest() + tejudge.selftest()
        for b in bad:
            print("selftest: " + b)
        print("selftest: %s" % ("FAIL" if bad else "ok"))
        sys.exit(1 if bad else 0)
    if not args.prep:
        ap.error("--prep is required")
    preps = [args.prep] + ([args.against] if args.against else [])
    for b in preps:
        if not os.access(b, os.X_OK):
            ap.error("%r is not an executable file" % b)
    seeds = [args.case] if args.case is not None else parse_seeds(args.seeds)
    work = args.keep or tempfile.mkdtemp(prefix="indep-")
    recs, base, specs = [], [], {}
    out = open(args.records, "w") if args.records else None
    for i, seed in enumerate(seeds):
        cls = hidden.pick(seed, args.cls) if args.cls else None
        spec, truth, both = score.run_case(preps, seed, args.mode, work, keep=bool(args.keep), extra=args.prep_args.split(), planes=args.planes, cls=cls)
        for r in both:
            r["cls"] = cls
        rec = both[0]
        if args.against:
            base.append(both[1])
        spec["truth_te"] = truth["te_kind"]
        spec["truth_te_size"] = truth["te_size"]
        spec["truth_scatter"] = truth["scatter"]
        specs[(args.mode, seed)] = spec
        recs.append(rec)
        if out:
            line = {"spec": spec, "record": rec}
            if args.against:
                line["against"] = both[1]
            out.write(json.dumps(line, default=float) + "\n")
        if args.case is None and (i + 1) % 25 == 0:
            print("  ... %d/%d" % (i + 1, len(seeds)), file=sys.stderr)
        if args.case is not None:
            print("case: " + describe(spec))
            print(json.dumps(spec, indent=1, default=float))
            if cls:
                print("class: %s" % json.dumps(spec["class"], default=float))
            print("truth: chord %.6f mm, LE (%.6f, %.6f) mm, TE point (%.6f, %.6f) mm, TE %s (end %.6f c), mirrored %s, scatter %.2e c" % (
                truth["chord_mm"], *truth["le_mm"], *truth["te_mm"], truth["te_kind"], truth["te_size"], truth["mirrored"], truth["scatter"]))
            for r in both:
                print("record (%s): %s" % (r["prep"], json.dumps(r, indent=1, default=float)))
                if args.keep:
                    print("rerun:  %s prep %s --units %s -o %s%s" % (r["prep"], r["file"], spec.get("units", "mm"), r["output"], " " + args.prep_args if args.prep_args else ""))
            return
    if out:
        out.close()
    table(args, recs, specs, args.prep)
    if args.against:
        print()
        table(args, base, specs, args.against)
        print()
        changes(recs, base, specs)
    if not args.keep:
        try:
            os.rmdir(work)
        except OSError:
            pass


def conventions_selftest():
    """The placement's truth frame, read back through the README's frame
    formula, gives the twist an upper/lower mirror implies (180 - (-twist)),
    and a nose-other-way mirror keeps the twist; and the truth's leading edge is the outline point
    farthest from its trailing-edge point."""
    bad = []
    for flip, mirrored, want in (("none", False, lambda t: t), ("x", True, lambda t: t), ("y", True, lambda t: 180 - (-t))):
        for tw in (-25.0, 3.0, 35.0):
            rot = np.radians(tw)
            d = np.array([np.cos(rot), -np.sin(rot)])  # chord line placed nose-up by tw
            if flip == "x":
                d[0] = -d[0]
            if flip == "y":
                d[1] = -d[1]
            if mirrored:
                d[0] = -d[0]
            got = np.degrees(-np.arctan2(d[1], d[0]))
            if abs(score._wrap(got - want(tw))) > 1e-9:
                bad.append("flip %s twist %g: frame twist %.6f, want %.6f" % (flip, tw, got, want(tw)))
    bad += scoring_selftest()
    o = ol.Outline(naca.five_digit(2, 3, 0.12, True), "rounded", radius=0.004)
    qn = o.normalized()
    far = np.max(np.hypot(qn[:, 0] - 1, qn[:, 1]))
    if abs(far - 1) > 1e-8:
        bad.append("rounded 23012: farthest outline point from the TE point at %.10f chord, want 1" % far)
    if ol.nearest(qn, np.zeros((1, 2)))[0] > 1e-7:
        bad.append("the leading edge is not on the outline")
    return bad


def scoring_selftest():
    """The scorer on documents made from the truth: the true frame and
    outline score zero error; a twist off by 0.5 deg, a chord 1 % long and
    the section turned upside down are each caught as wrong."""
    bad = []
    for seed in (3, 7, 12):
        spec, truth, lines = scan.draw(seed, "normal")
        truth["rows"] = lines[truth["first_line"] - 1 :]
        d = truth["te_mm"] - truth["le_mm"]
        mir = truth["mirrored"]
        if mir:
            d[0] = -d[0]
        tau = float(np.degrees(-np.arctan2(d[1], d[0])))
        nodes = truth["normalized"][::25].tolist()
        doc = {"frame": {"chord": truth["chord_mm"], "twist_deg": tau, "le": truth["le_mm"].tolist(), "mirrored": mir},
               "nodes": nodes, "trailing_edge": {"kind": truth["te_kind"]},
               "uncertainty": {"chord": 0.0, "twist_deg": 0.0, "le": 0.0, "surface": 0.0}, "source": {"dropped": []}}
        r = score.evaluate(spec, truth, doc)
        if max(r["chord_err"], r["twist_err"] / 1e3, r["le_err"], r["node_err"]) > 1e-9 or r["wrong"]:
            bad.append("seed %d: the truth's own document scores chord %.2e twist %.2e le %.2e node %.2e wrong %r" % (
                seed, r["chord_err"], r["twist_err"], r["le_err"], r["node_err"], r["wrong"]))
        for what, edit, want in (
            ("twist +0.5", lambda g: g["frame"].update(twist_deg=tau + 0.5), "twist"),
            ("chord +1 %", lambda g: g["frame"].update(chord=truth["chord_mm"] * 1.01), "chord"),
            ("upside down", lambda g: g.update(nodes=[[x, -y] for x, y in nodes]), "nodes"),
        ):
            g = json.loads(json.dumps(doc))
            edit(g)
            r = score.evaluate(spec, truth, g)
            if spec["shape"]["family"] == "sym" and what == "upside down":
                continue
            if want not in r["wrong"].split("+"):
                bad.append("seed %d: %s scored wrong=%r, want %s" % (seed, what, r["wrong"], want))
    # In 3D: the truth's document, its frame in the plane's coordinates,
    # scores zero; the same frame read in another basis of the plane is off.
    spec, truth, lines = scan.draw(5, "normal", planes=1.0)
    truth["rows"] = lines[truth["first_line"] - 1 :]
    pl = {k: np.asarray(v) for k, v in spec["plane"].items()}
    d = truth["te_mm"] - truth["le_mm"]
    doc = {"frame": {"chord": truth["chord_mm"], "twist_deg": float(np.degrees(-np.arctan2(d[1], d[0]))),
                     "le": truth["le_mm"].tolist(), "mirrored": False,
                     "plane": {k: v.tolist() for k, v in pl.items()}},
           "nodes": truth["normalized"][::25].tolist(), "trailing_edge": {"kind": truth["te_kind"]},
           "uncertainty": {"chord": 0.0, "twist_deg": 0.0, "le": 0.0, "surface": 0.0}, "source": {"dropped": []}}
    r = score.evaluate(spec, truth, doc)
    if max(r["twist_err"] / 1e3, r["le_err"], r["node_err"]) > 1e-9:
        bad.append("3D: the truth's own document scores twist %.2e le %.2e node %.2e" % (r["twist_err"], r["le_err"], r["node_err"]))
    doc["frame"]["plane"]["u"], doc["frame"]["plane"]["v"] = pl["v"].tolist(), pl["u"].tolist()
    r = score.evaluate(spec, truth, doc)
    if r["twist_err"] < 1:
        bad.append("3D: a frame read in a swapped basis scores twist %.2e deg" % r["twist_err"])
    return bad


if __name__ == "__main__":
    main()
