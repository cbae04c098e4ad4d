#!/usr/bin/env python3
"""Random ontologies with ObjectHasValue in the TBox (SHI + nominal fillers + an ABox), for
differential testing of the nominal absorption and the reuse of the ABox's completion
graph against the oracle (`scripts/oracle-diff --files ...`). Test tooling only.

    scripts/gen_nominal.py --seed S [--count N] [--out DIR]

Each file declares 4-12 classes, 1-3 object properties (sub-properties, inverses,
transitivity, domains, ranges), 2-5 individuals with class and property assertions, and
mixes SubClassOf / EquivalentClasses / DisjointClasses whose sides use ObjectHasValue
(also of inverse properties, inside ⊓ and ⊔ and under ∃/∀), so that a fair share of the
subsumptions and unsatisfiable classes depend on the individuals. No number restrictions
or functional properties (with nominals they need SHOIQ, which wherefore refuses).
"""

import argparse
import os
import random


def gen(seed):
    rnd = random.Random(seed)
    ns = "http://example.org/nom/%d#" % seed
    classes = [":C%d" % i for i in range(rnd.randint(4, 12))]
    props = [":p%d" % i for i in range(rnd.randint(1, 3))]
    inds = [":i%d" % i for i in range(rnd.randint(2, 5))]
    ax = []

    def role():
        p = rnd.choice(props)
        return "ObjectInverseOf(%s)" % p if rnd.random() < 0.25 else p

    def ce(depth=0):
        k = rnd.random()
        if depth > 2 or k < 0.3:
            return rnd.choice(classes)
        if k < 0.5:
            return "ObjectHasValue(%s %s)" % (role(), rnd.choice(inds))
        if k < 0.6:
            return "ObjectComplementOf(%s)" % ce(depth + 1)
        if k < 0.72:
            return "ObjectIntersectionOf(%s %s)" % (ce(depth + 1), ce(depth + 1))
        if k < 0.82:
            return "ObjectUnionOf(%s %s)" % (ce(depth + 1), ce(depth + 1))
        if k < 0.92:
            return "ObjectSomeValuesFrom(%s %s)" % (role(), ce(depth + 1))
        return "ObjectAllValuesFrom(%s %s)" % (role(), ce(depth + 1))

    for _ in range(rnd.randint(4, 14)):
        k = rnd.random()
        if k < 0.45:
            ax.append("SubClassOf(%s %s)" % (rnd.choice(classes), ce()))
        elif k < 0.65:
            ax.append("EquivalentClasses(%s %s)" % (rnd.choice(classes), ce()))
        elif k < 0.8:
            ax.append("SubClassOf(%s %s)" % (ce(), rnd.choice(classes)))
        else:
            # Two different operands: DisjointClasses(X X) is DisjointClasses(X), which
            # OWL 2 does not allow (at least two classes).
            a, b = ce(), ce()
            while a == b:
                b = ce()
            ax.append("DisjointClasses(%s %s)" % (a, b))
    if len(props) > 1 and rnd.random() < 0.5:
        ax.append("SubObjectPropertyOf(%s %s)" % tuple(rnd.sample(props, 2)))
    if rnd.random() < 0.3:
        ax.append("TransitiveObjectProperty(%s)" % rnd.choice(props))
    if rnd.random() < 0.3:
        ax.append("InverseObjectProperties(%s %s)" % (rnd.choice(props), rnd.choice(props)))
    if rnd.random() < 0.3:
        ax.append("ObjectPropertyDomain(%s %s)" % (rnd.choice(props), rnd.choice(classes)))
    if rnd.random() < 0.3:
        ax.append("ObjectPropertyRange(%s %s)" % (rnd.choice(props), rnd.choice(classes)))
    for _ in range(rnd.randint(1, 5)):
        if rnd.random() < 0.5:
            ax.append("ClassAssertion(%s %s)" % (ce(1), rnd.choice(inds)))
        else:
            ax.append("ObjectPropertyAssertion(%s %s %s)"
                      % (rnd.choice(props), rnd.choice(inds), rnd.choice(inds)))
    decl = ["Declaration(Class(%s))" % c for c in classes]
    decl += ["Declaration(ObjectProperty(%s))" % p for p in props]
    decl += ["Declaration(NamedIndividual(%s))" % i for i in inds]
    return "Prefix(:=<%s>)\nOntology(<%s>\n%s\n)\n" % (ns, ns[:-1], "\n".join(decl + ax))


def main():
    ap = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    ap.add_argument("--seed", type=int, required=True)
    ap.add_argument("--count", type=int, default=1)
    ap.add_argument("--out", default=".")
    a = ap.parse_args()
    os.makedirs(a.out, exist_ok=True)
    for s in range(a.seed, a.seed + a.count):
        path = os.path.join(a.out, "nom-%d.ofn" % s)
        tmp = path + ".tmp"
        with open(tmp, "w", encoding="utf-8") as f:
            f.write(gen(s))
        os.replace(tmp, path)


if __name__ == "__main__":
    main()
