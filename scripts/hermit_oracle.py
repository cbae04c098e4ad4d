#!/usr/bin/env python3
"""Test oracle: runs the HermiT OWL 2 DL reasoner bundled in the owlready2 PyPI package.

Used ONLY to produce expected answers for tests and for differential testing; it is never
shipped and never a run-time dependency of wherefore.

HermiT's command-line entry class (org.semanticweb.HermiT.cli.CommandLine) is run with
`-k -c -P -o OUT FILE`: `-k` checks consistency (HermiT throws
InconsistentOntologyException when the ontology is inconsistent), `-c -P -o OUT` writes the
classified hierarchy as a pretty-printed functional-syntax ontology, with one Declaration per
class of the signature, the direct SubClassOf edges and the EquivalentClasses groups (those
with owl:Nothing are the unsatisfiable classes). This module turns that into the JSON form of
`wherefore classify` (see the contract): the full transitive closure of the hierarchy over the
named classes of the signature.

Usage as a command:  python3 scripts/hermit_oracle.py FILE [--timeout S]  (prints JSON)
"""

import json
import os
import re
import subprocess
import sys
import tempfile
import time
import zipfile

OWL = "http://www.w3.org/2002/07/owl#"
THING = OWL + "Thing"
NOTHING = OWL + "Nothing"
STANDARD_PREFIXES = {
    "owl": OWL,
    "rdf": "http://www.w3.org/1999/02/22-rdf-syntax-ns#",
    "rdfs": "http://www.w3.org/2000/01/rdf-schema#",
    "xsd": "http://www.w3.org/2001/XMLSchema#",
}


class OracleError(Exception):
    """The oracle could not answer (parse error, crash or time limit)."""


def hermit_dir():
    """Folder of owlready2's bundled HermiT (HermiT.jar plus owlready2's patched classes)."""
    try:
        import owlready2  # noqa: F401  (only its location is used)
    except ImportError as e:
        raise OracleError("owlready2 is not installed: run `pip install owlready2`") from e
    import importlib.util

    spec = importlib.util.find_spec("owlready2")
    return os.path.join(os.path.dirname(spec.origin), "hermit")


def classpath():
    """The classpath owlready2 itself uses: its patched classes first, then the jar."""
    d = hermit_dir()
    return os.pathsep.join([d, os.path.join(d, "HermiT.jar")])


def versions():
    """Versions of the oracle parts: owlready2 and the HermiT jar's manifest version."""
    import importlib.metadata

    ov = importlib.metadata.version("owlready2")
    hv = "unknown"
    with zipfile.ZipFile(os.path.join(hermit_dir(), "HermiT.jar")) as z:
        for line in z.read("META-INF/MANIFEST.MF").decode("utf-8", "replace").splitlines():
            if line.startswith("Implementation-Version:"):
                hv = line.split(":", 1)[1].strip()
    jv = subprocess.run(["java", "-version"], capture_output=True, text=True).stderr.splitlines()
    return {"owlready2": ov, "hermit": hv, "java": jv[0] if jv else "unknown"}


_TOKEN = re.compile(r"<[^>]*>|[A-Za-z_][\w.\-]*:[\w.\-]*|:[\w.\-]*|\(|\)|[^\s()]+")


def _expand(tok, prefixes):
    if tok.startswith("<") and tok.endswith(">"):
        return tok[1:-1]
    if ":" in tok:
        pre, local = tok.split(":", 1)
        if pre in prefixes:
            return prefixes[pre] + local
    raise OracleError("cannot expand name %r in HermiT's output" % tok)


def parse_hierarchy(text):
    """Parses HermiT's pretty-printed hierarchy into (classes, direct edges, equivalence groups)."""
    prefixes = dict(STANDARD_PREFIXES)
    for m in re.finditer(r"Prefix\(\s*([\w.\-]*):=<([^>]*)>\s*\)", text):
        prefixes[m.group(1)] = m.group(2)
    body_start = text.find("Ontology(")
    if body_start < 0:
        raise OracleError("no Ontology( in HermiT's output")
    toks = _TOKEN.findall(text[body_start:])
    classes, edges, groups = set(), [], []
    i = 0
    while i < len(toks):
        t = toks[i]
        if t in ("SubClassOf", "EquivalentClasses", "Declaration") and i + 1 < len(toks) and toks[i + 1] == "(":
            depth, j, args = 1, i + 2, []
            while j < len(toks) and depth > 0:
                if toks[j] == "(":
                    depth += 1
                elif toks[j] == ")":
                    depth -= 1
                elif depth == 1 or (t == "Declaration" and depth == 2):
                    args.append(toks[j])
                j += 1
            if t == "Declaration":
                if args and args[0] == "Class":
                    classes.add(_expand(args[1], prefixes))
            elif t == "SubClassOf":
                a, b = (_expand(x, prefixes) for x in args)
                edges.append((a, b))
            else:
                groups.append([_expand(x, prefixes) for x in args])
            i = j
        else:
            i += 1
    return classes, edges, groups


def closure_json(signature, edges, groups):
    """Contract JSON of a consistent ontology from HermiT's direct hierarchy.

    Nodes are equivalence groups; the entailed subsumptions are the reflexive-transitive
    closure of the direct edges; owl:Thing's group members are above every satisfiable class.
    """
    rep = {}
    for g in groups:
        root = g[0]
        for c in g:
            rep[c] = root
    r = lambda c: rep.get(c, c)  # noqa: E731
    members = {}
    for c in set(signature) | {THING, NOTHING} | set(rep):
        members.setdefault(r(c), set()).add(c)
    ups = {}
    for a, b in edges:
        ups.setdefault(r(a), set()).add(r(b))
    unsat = sorted(c for c in members.get(r(NOTHING), ()) if c != NOTHING and c in signature)
    unsat_set = set(unsat) | {NOTHING}
    anc_cache = {}

    def ancestors(n):
        if n in anc_cache:
            return anc_cache[n]
        seen, stack = {n}, [n]
        while stack:
            x = stack.pop()
            for y in ups.get(x, ()):
                if y not in seen:
                    seen.add(y)
                    stack.append(y)
        seen.add(r(THING))
        anc_cache[n] = seen
        return seen

    subs = []
    named = sorted(c for c in signature if c not in (THING, NOTHING))
    for a in named:
        if a in unsat_set:
            continue
        for n in ancestors(r(a)):
            for b in members.get(n, ()):
                if b != a and b in signature and b not in (THING, NOTHING):
                    subs.append([a, b])
    subs.sort()
    return {"consistent": True, "unsatisfiable": unsat, "subsumptions": subs}


def declared_classes(path):
    """Classes declared in a functional-syntax file (full IRIs or prefixed names)."""
    try:
        with open(path, encoding="utf-8") as f:
            text = f.read()
    except (OSError, UnicodeDecodeError):
        return set()
    if "Ontology(" not in text:
        return set()
    prefixes = dict(STANDARD_PREFIXES)
    for m in re.finditer(r"Prefix\(\s*([\w.\-]*):=<([^>]*)>\s*\)", text):
        prefixes[m.group(1)] = m.group(2)
    out = set()
    for m in re.finditer(r"Declaration\(\s*Class\(\s*(<[^>]*>|[\w.\-]*:[\w.\-]*)\s*\)\s*\)", text):
        out.add(_expand(m.group(1), prefixes))
    return out


def _strip_comments(path, tmp):
    """A copy of a functional-syntax file without its `#` comment lines.

    OWL 2 functional syntax allows `#` comments, but the OWL API 3.4.3 parser inside
    HermiT 1.3.8 rejects them; other files are passed through unchanged.
    """
    try:
        with open(path, encoding="utf-8") as f:
            lines = f.read().splitlines(keepends=True)
    except (OSError, UnicodeDecodeError):
        return path
    if not any(l.lstrip().startswith("#") for l in lines) or not any("Ontology(" in l for l in lines):
        return path
    copy = os.path.join(tmp, "input.ofn")
    with open(copy, "w", encoding="utf-8") as f:
        f.writelines("\n" if l.lstrip().startswith("#") else l for l in lines)
    return copy


def classify(path, timeout=120.0, memory_mb=2000):
    """Runs HermiT on `path` and returns (contract JSON dict, seconds of wall time)."""
    with tempfile.TemporaryDirectory(prefix="hermit-") as tmp:
        out = os.path.join(tmp, "hierarchy.ofn")
        path_for_hermit = _strip_comments(path, tmp)
        cmd = [
            "java", "-Xmx%dM" % memory_mb, "-cp", classpath(),
            "org.semanticweb.HermiT.cli.CommandLine",
            "-k", "-c", "-P", "-o", out, os.path.abspath(path_for_hermit),
        ]
        t0 = time.perf_counter()
        try:
            p = subprocess.run(cmd, capture_output=True, text=True, timeout=timeout)
        except subprocess.TimeoutExpired as e:
            raise OracleError("HermiT timed out after %.0f s on %s" % (timeout, path)) from e
        secs = time.perf_counter() - t0
        return _answer(path, out, p.returncode, p.stdout, p.stderr), secs


def _answer(path, out, returncode, stdout, stderr):
    """The contract JSON from one HermiT run's hierarchy file and messages."""
    if "InconsistentOntologyException" in stderr:
        return {"consistent": False, "unsatisfiable": [], "subsumptions": []}
    if returncode != 0 or not os.path.exists(out) or "pear-shaped" in stderr:
        raise OracleError("HermiT failed on %s (exit %d): %s" % (path, returncode, stderr[-2000:]))
    with open(out, encoding="utf-8") as f:
        text = f.read()
    # `-k` writes its verdict to the same output file as the hierarchy.
    if "owl#Thing is satisfiable" not in text + stdout:
        raise OracleError("HermiT did not confirm consistency of %s: %s" % (path, text[:500]))
    classes, edges, groups = parse_hierarchy(text)
    signature = (classes | declared_classes(path)) - {THING, NOTHING}
    return closure_json(signature, edges, groups)


class Batch:
    """HermiT's command line run on many files in one JVM (scripts/HermitBatch.java).

    Same entry class, options and answer conversion as `classify`; only the JVM start-up
    is shared. The seconds returned are measured inside the JVM (no start-up), so they are
    not comparable with `classify`'s wall times. A file that takes longer than `timeout`
    kills the JVM (restarted for the next file) and raises OracleError.
    """

    def __init__(self, memory_mb=2000):
        self.memory_mb = memory_mb
        self.build = tempfile.mkdtemp(prefix="hermit-batch-")
        here = os.path.dirname(os.path.abspath(__file__))
        jar = os.path.join(hermit_dir(), "HermiT.jar")
        subprocess.run(["javac", "-cp", jar, "-d", self.build,
                        os.path.join(here, "HermitBatch.java")], check=True)
        self.proc = None

    def _start(self):
        cmd = ["java", "-Xmx%dM" % self.memory_mb, "-cp",
               classpath() + os.pathsep + self.build, "HermitBatch"]
        self.proc = subprocess.Popen(cmd, stdin=subprocess.PIPE, stdout=subprocess.PIPE,
                                     text=True, bufsize=1)

    def close(self):
        if self.proc is not None:
            self.proc.kill()
            self.proc.wait()
            self.proc = None

    def classify(self, path, timeout=120.0):
        import select
        if self.proc is None:
            self._start()
        with tempfile.TemporaryDirectory(prefix="hermit-") as tmp:
            out = os.path.join(tmp, "hierarchy.ofn")
            log = os.path.join(tmp, "log.txt")
            src = os.path.abspath(_strip_comments(path, tmp))
            self.proc.stdin.write("%s\t%s\t%s\n" % (src, out, log))
            self.proc.stdin.flush()
            ready, _, _ = select.select([self.proc.stdout], [], [], timeout)
            line = self.proc.stdout.readline() if ready else ""
            if not line.startswith("DONE\t"):
                self.close()
                raise OracleError("HermiT timed out after %.0f s on %s" % (timeout, path))
            secs = float(line.split("\t")[1])
            with open(log, encoding="utf-8", errors="replace") as f:
                messages = f.read()
            return _answer(path, out, 0, messages, messages), secs


def pellet_classify(path, timeout=300.0):
    """Second opinion: Pellet 2.3.1, also bundled in owlready2, as (contract JSON, seconds).

    Used to cross-check HermiT where the two could differ (e.g. numeric datatypes, see
    docs/oracle.md); it prints an indented tree with `=` between equivalent classes.
    """
    d = os.path.join(os.path.dirname(hermit_dir()), "pellet")
    with tempfile.TemporaryDirectory(prefix="pellet-") as tmp:
        src = _strip_comments(path, tmp)
        cmd = ["java", "-Xmx2000M", "-cp", os.path.join(d, "*"), "pellet.Pellet", "classify",
               "-l", "OWLAPIv3", os.path.abspath(src)]
        t0 = time.perf_counter()
        try:
            p = subprocess.run(cmd, capture_output=True, text=True, timeout=timeout)
        except subprocess.TimeoutExpired as e:
            raise OracleError("Pellet timed out after %.0f s on %s" % (timeout, path)) from e
        secs = time.perf_counter() - t0
    text = p.stdout + p.stderr
    if "Ontology is inconsistent" in text:
        return {"consistent": False, "unsatisfiable": [], "subsumptions": []}, secs
    stack, edges, groups, classes = [], [], [], set()
    seen_root = False
    for line in p.stdout.splitlines():
        m = re.match(r"^( +)(\S.*)$", line)
        if not m or "://" not in line or "complete in" in line:
            continue
        names = [x.strip() for x in m.group(2).split(" = ")]
        level = (len(m.group(1)) - 1) // 3
        classes.update(names)
        if len(names) > 1:
            groups.append(names)
        if level == 0:
            stack = [names[0]]
            seen_root = True
            continue
        stack = stack[:level] + [names[0]]
        edges.append((names[0], stack[level - 1]))
    if p.returncode != 0 or not seen_root:
        raise OracleError("Pellet failed on %s (exit %d): %s" % (path, p.returncode, text[-1500:]))
    signature = (classes | declared_classes(path)) - {THING, NOTHING}
    return closure_json(signature, edges, groups), secs


def dump_json(res):
    """The classify JSON, one subsumption per line so that diffs stay readable."""
    subs = ",\n".join("  " + json.dumps(p) for p in res["subsumptions"])
    return (
        '{\n "consistent": %s,\n "unsatisfiable": %s,\n "subsumptions": [%s%s%s]\n}\n'
        % (
            "true" if res["consistent"] else "false",
            json.dumps(res["unsatisfiable"]),
            "\n" if subs else "",
            subs,
            "\n " if subs else "",
        )
    )


def write_atomic(path, text):
    tmp = path + ".tmp"
    with open(tmp, "w", encoding="utf-8") as f:
        f.write(text)
    os.replace(tmp, path)


def main(argv):
    import argparse

    ap = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    ap.add_argument("files", nargs="*")
    ap.add_argument("--timeout", type=float, default=120.0)
    ap.add_argument("--versions", action="store_true", help="print the oracle's versions")
    ap.add_argument("--pellet", action="store_true", help="ask Pellet (second opinion) instead")
    a = ap.parse_args(argv)
    if a.versions:
        print(json.dumps(versions(), indent=1))
    for f in a.files:
        res, secs = (pellet_classify if a.pellet else classify)(f, a.timeout)
        print(json.dumps(res, indent=1))
        print("hermit: %.3f s" % secs, file=sys.stderr)


if __name__ == "__main__":
    try:
        main(sys.argv[1:])
    except OracleError as e:
        print("oracle error: %s" % e, file=sys.stderr)
        sys.exit(2)
