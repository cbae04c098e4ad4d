#!/usr/bin/env python3
"""Seeded generator of random SHIQ ontologies (plus numeric data) in OWL 2 functional syntax.

One seed gives one ontology, byte for byte, on every machine (Python's `random.Random`
with an integer seed is stable across versions for the calls used here).

SHIQ's global restriction (Horrocks, Sattler & Tobies 1999): number restrictions and
(inverse-)functionality only on SIMPLE roles, i.e. roles that are neither transitive nor
have a transitive sub-role (inverses included). The generator keeps two pools of object
properties: simple ones, never transitive and with only simple sub-properties, and free
ones; `check_simple` recomputes simplicity over the role hierarchy with inverses and the
generator asserts it before writing.

Left out on purpose (hand-made tests cover them): property chains, ObjectHasSelf, HasKey,
ObjectHasValue, ObjectOneOf, datatypes other than xsd:integer/decimal/double, data
cardinalities.

Usage: gen_shiq.py --seed S [--count N] --out DIR   (writes DIR/<seed>.ofn, one per seed)
       gen_shiq.py --seed S                          (prints one ontology)
"""

import argparse
import os
import random
import sys

XSD = "http://www.w3.org/2001/XMLSchema#"
NUMERIC = ["integer", "decimal", "double"]
FACETS = ["minInclusive", "maxInclusive", "minExclusive", "maxExclusive"]


class Gen:
    """State of one ontology under construction."""

    def __init__(self, seed):
        self.seed = seed
        self.rng = random.Random(seed)
        rng = self.rng
        size = rng.choices(["tiny", "small", "medium", "large"], [25, 35, 28, 12])[0]
        lo, hi = {"tiny": (2, 5), "small": (5, 12), "medium": (12, 25), "large": (25, 40)}[size]
        self.n_classes = rng.randint(lo, hi)
        self.classes = [":C%d" % i for i in range(self.n_classes)]
        n_props = rng.randint(1, min(6, 1 + self.n_classes // 3))
        self.props = [":r%d" % i for i in range(n_props)]
        # Pool split: simple roles may carry number restrictions and functionality.
        self.simple = set(p for p in self.props if rng.random() < 0.6)
        if not self.simple:
            self.simple.add(self.props[0])
        self.data_props = []
        self.data_type = {}
        if rng.random() < 0.35:
            for i in range(rng.randint(1, 3)):
                d = ":d%d" % i
                self.data_props.append(d)
                self.data_type[d] = rng.choice(NUMERIC)
        n_ind = rng.choices([0, rng.randint(1, 3), rng.randint(3, 6)], [70, 22, 8])[0]
        self.inds = [":i%d" % i for i in range(n_ind)]
        self.axioms = []
        # Role hierarchy edges (sub, sup) over role expressions (name, inverted?).
        self.role_edges = []
        self.transitive = set()
        self.max_depth = rng.choice([1, 2, 2, 3])

    # ---- roles -------------------------------------------------------------------------

    def role(self, simple_only=False):
        pool = sorted(self.simple) if simple_only else self.props
        p = self.rng.choice(pool)
        if self.rng.random() < 0.3:
            return "ObjectInverseOf(%s)" % p
        return p

    def rbox(self):
        rng = self.rng
        free = [p for p in self.props if p not in self.simple]
        for p in free:
            if rng.random() < 0.6:
                self.transitive.add(p)
                self.axioms.append("TransitiveObjectProperty(%s)" % p)
        for _ in range(rng.randint(0, len(self.props))):
            sub, sup = rng.choice(self.props), rng.choice(self.props)
            if sub == sup:
                continue
            # A simple role's sub-roles must be simple too.
            if sup in self.simple and sub not in self.simple:
                continue
            inv = rng.random() < 0.25
            sub_e = "ObjectInverseOf(%s)" % sub if inv else sub
            self.role_edges.append(((sub, inv), (sup, False)))
            self.axioms.append("SubObjectPropertyOf(%s %s)" % (sub_e, sup))
        if len(self.props) >= 2 and rng.random() < 0.4:
            p, q = rng.sample(self.props, 2)
            if (p in self.simple) == (q in self.simple):
                self.role_edges.append(((p, False), (q, True)))
                self.role_edges.append(((q, True), (p, False)))
                self.axioms.append("InverseObjectProperties(%s %s)" % (p, q))
        for p in self.props:
            if rng.random() < 0.12:
                self.role_edges.append(((p, False), (p, True)))
                self.axioms.append("SymmetricObjectProperty(%s)" % p)
        for p in sorted(self.simple):
            if rng.random() < 0.2:
                self.axioms.append("FunctionalObjectProperty(%s)" % p)
            if rng.random() < 0.12:
                self.axioms.append("InverseFunctionalObjectProperty(%s)" % p)
        for p in self.props:
            if rng.random() < 0.2:
                self.axioms.append("ObjectPropertyDomain(%s %s)" % (p, self.expr(1)))
            if rng.random() < 0.2:
                self.axioms.append("ObjectPropertyRange(%s %s)" % (p, self.expr(1)))

    def check_simple(self):
        """Recomputes which roles are non-simple and asserts the pools are right."""
        edges = set()
        for (a, ai), (b, bi) in self.role_edges:
            edges.add(((a, ai), (b, bi)))
            edges.add(((a, not ai), (b, not bi)))  # r ⊑ s implies r⁻ ⊑ s⁻
        nodes = [(p, i) for p in self.props for i in (False, True)]
        non_simple = set((p, i) for p in self.transitive for i in (False, True))
        changed = True
        while changed:
            changed = False
            for a, b in edges:
                if a in non_simple and b not in non_simple:
                    non_simple.add(b)
                    changed = True
        for p in self.simple:
            assert (p, False) not in non_simple and (p, True) not in non_simple, (self.seed, p)
        return nodes

    # ---- data ----------------------------------------------------------------------------

    def literal(self, dt):
        rng = self.rng
        k = rng.randint(-2, 9)
        if dt == "integer":
            return '"%d"^^xsd:integer' % k
        if dt == "decimal":
            return '"%s"^^xsd:decimal' % rng.choice(["%d.5" % k, "%d" % k, "%d.25" % k])
        return '"%s"^^xsd:double' % rng.choice(["%d.5" % k, "%d.0" % k, "%d.5E0" % k])

    def data_type_of(self, d):
        # Now and then a different numeric type than the property's usual one, so that the
        # value spaces (integer ⊂ decimal; double disjoint from decimal) are exercised.
        if self.rng.random() < 0.12:
            return self.rng.choice(NUMERIC)
        return self.data_type[d]

    def data_range(self, d):
        rng = self.rng
        dt = self.data_type_of(d)
        if rng.random() < 0.25:
            return "xsd:" + dt
        facets = rng.sample(FACETS, rng.choice([1, 2, 2]))
        parts = " ".join("xsd:%s %s" % (f, self.literal(dt)) for f in facets)
        return "DatatypeRestriction(xsd:%s %s)" % (dt, parts)

    def data_expr(self):
        rng = self.rng
        d = rng.choice(self.data_props)
        k = rng.random()
        if k < 0.45:
            return "DataSomeValuesFrom(%s %s)" % (d, self.data_range(d))
        if k < 0.75:
            return "DataAllValuesFrom(%s %s)" % (d, self.data_range(d))
        return "DataHasValue(%s %s)" % (d, self.literal(self.data_type_of(d)))

    # ---- classes ---------------------------------------------------------------------------

    def named(self):
        r = self.rng.random()
        if r < 0.015:
            return "owl:Nothing"
        if r < 0.03:
            return "owl:Thing"
        return self.rng.choice(self.classes)

    def expr(self, depth):
        rng = self.rng
        if depth <= 0 or rng.random() < 0.3:
            if rng.random() < 0.15:
                return "ObjectComplementOf(%s)" % self.named()
            return self.named()
        kinds = ["and", "or", "not", "some", "all", "min", "max", "exact"]
        weights = [14, 10, 6, 20, 12, 7, 7, 4]
        if self.data_props:
            kinds.append("data")
            weights.append(12)
        k = rng.choices(kinds, weights)[0]
        sub = lambda: self.expr(depth - 1)  # noqa: E731
        if k == "and":
            return "ObjectIntersectionOf(%s)" % " ".join(sub() for _ in range(rng.randint(2, 3)))
        if k == "or":
            return "ObjectUnionOf(%s)" % " ".join(sub() for _ in range(rng.randint(2, 3)))
        if k == "not":
            return "ObjectComplementOf(%s)" % sub()
        if k == "some":
            return "ObjectSomeValuesFrom(%s %s)" % (self.role(), sub())
        if k == "all":
            return "ObjectAllValuesFrom(%s %s)" % (self.role(), sub())
        if k == "data":
            return self.data_expr()
        n = rng.choices([0, 1, 2, 3], [5, 40, 40, 15])[0]
        name = {"min": "ObjectMinCardinality", "max": "ObjectMaxCardinality",
                "exact": "ObjectExactCardinality"}[k]
        if rng.random() < 0.2:
            return "%s(%d %s)" % (name, n, self.role(simple_only=True))
        return "%s(%d %s %s)" % (name, n, self.role(simple_only=True), sub())

    def tbox(self):
        rng = self.rng
        n = self.n_classes
        n_ax = rng.randint(max(1, n // 2), int(n * 1.5) + 2)
        for _ in range(n_ax):
            k = rng.choices(["sub", "subrev", "gci", "equiv", "equivnamed", "disj", "dunion"],
                            [52, 6, 4, 14, 3, 12, 2])[0]
            c = rng.choice(self.classes)
            if k == "sub":
                self.axioms.append("SubClassOf(%s %s)" % (c, self.expr(rng.randint(1, self.max_depth))))
            elif k == "subrev":
                self.axioms.append("SubClassOf(%s %s)" % (self.expr(rng.randint(1, 2)), c))
            elif k == "gci":
                self.axioms.append("SubClassOf(%s %s)" % (self.expr(1), self.expr(rng.randint(1, 2))))
            elif k == "equiv":
                self.axioms.append("EquivalentClasses(%s %s)" % (c, self.expr(rng.randint(1, self.max_depth))))
            elif k == "equivnamed" and n >= 2:
                a, b = rng.sample(self.classes, 2)
                self.axioms.append("EquivalentClasses(%s %s)" % (a, b))
            elif k == "disj" and n >= 2:
                cs = rng.sample(self.classes, min(n, rng.choice([2, 2, 3])))
                self.axioms.append("DisjointClasses(%s)" % " ".join(cs))
            elif k == "dunion" and n >= 4:
                cs = rng.sample(self.classes, rng.randint(3, min(4, n)))
                self.axioms.append("DisjointUnion(%s)" % " ".join(cs))
        # Planted conflicts so that a fair share of ontologies have unsatisfiable classes.
        if n >= 3 and rng.random() < 0.35:
            a, b, c = rng.sample(self.classes, 3)
            t = rng.randint(0, 3)
            if t == 0:
                self.axioms += ["SubClassOf(%s %s)" % (a, b), "SubClassOf(%s %s)" % (a, c),
                                "DisjointClasses(%s %s)" % (b, c)]
            elif t == 1:
                r = self.role(simple_only=True)
                self.axioms += ["SubClassOf(%s ObjectMinCardinality(2 %s %s))" % (a, r, b),
                                "SubClassOf(%s ObjectMaxCardinality(1 %s))" % (a, r)]
            elif t == 2:
                r = self.role()
                self.axioms += ["SubClassOf(%s ObjectSomeValuesFrom(%s %s))" % (a, r, b),
                                "SubClassOf(%s ObjectAllValuesFrom(%s ObjectComplementOf(%s)))" % (a, r, b)]
            else:
                self.axioms += ["SubClassOf(%s %s)" % (a, b),
                                "SubClassOf(%s ObjectComplementOf(%s))" % (b, a)]

    def dbox(self):
        rng = self.rng
        for d in self.data_props:
            if rng.random() < 0.4:
                self.axioms.append("FunctionalDataProperty(%s)" % d)
            if rng.random() < 0.3:
                self.axioms.append("DataPropertyDomain(%s %s)" % (d, rng.choice(self.classes)))
            if rng.random() < 0.4:
                self.axioms.append("DataPropertyRange(%s %s)" % (d, self.data_range(d)))

    def abox(self):
        rng = self.rng
        if not self.inds:
            return
        for _ in range(rng.randint(1, len(self.inds))):
            k = rng.choices(["cls", "prop", "neg", "same", "diff", "data"],
                            [30, 35, 6, 5, 8, 11 if self.data_props else 0])[0]
            a = rng.choice(self.inds)
            if k == "cls":
                e = self.expr(1) if rng.random() < 0.2 else rng.choice(self.classes)
                self.axioms.append("ClassAssertion(%s %s)" % (e, a))
            elif k == "prop":
                self.axioms.append("ObjectPropertyAssertion(%s %s %s)" % (rng.choice(self.props), a, rng.choice(self.inds)))
            elif k == "neg":
                self.axioms.append("NegativeObjectPropertyAssertion(%s %s %s)" % (rng.choice(self.props), a, rng.choice(self.inds)))
            elif k == "same" and len(self.inds) >= 2:
                self.axioms.append("SameIndividual(%s)" % " ".join(rng.sample(self.inds, 2)))
            elif k == "diff" and len(self.inds) >= 2:
                self.axioms.append("DifferentIndividuals(%s)" % " ".join(rng.sample(self.inds, min(len(self.inds), rng.randint(2, 3)))))
            elif k == "data":
                d = rng.choice(self.data_props)
                self.axioms.append("DataPropertyAssertion(%s %s %s)" % (d, a, self.literal(self.data_type_of(d))))
        # Planted ABox clash now and then, so that some ontologies are inconsistent.
        if rng.random() < 0.03:
            c = rng.choice(self.classes)
            self.axioms += ["ClassAssertion(%s %s)" % (c, self.inds[0]),
                            "ClassAssertion(ObjectComplementOf(%s) %s)" % (c, self.inds[0])]

    def render(self):
        self.rbox()
        self.check_simple()
        self.dbox()
        self.tbox()
        self.abox()
        base = "http://example.org/gen/%d" % self.seed
        out = [
            "Prefix(:=<%s#>)" % base,
            "Prefix(owl:=<http://www.w3.org/2002/07/owl#>)",
            "Prefix(rdf:=<http://www.w3.org/1999/02/22-rdf-syntax-ns#>)",
            "Prefix(rdfs:=<http://www.w3.org/2000/01/rdf-schema#>)",
            "Prefix(xsd:=<%s>)" % XSD,
            "",
            "Ontology(<%s>" % base,
        ]
        out += ["Declaration(Class(%s))" % c for c in self.classes]
        out += ["Declaration(ObjectProperty(%s))" % p for p in self.props]
        out += ["Declaration(DataProperty(%s))" % d for d in self.data_props]
        out += ["Declaration(NamedIndividual(%s))" % i for i in self.inds]
        out += self.axioms
        out.append(")")
        return "\n".join(out) + "\n"


def generate(seed):
    """The ontology for `seed`, as functional-syntax text."""
    return Gen(seed).render()


def main(argv):
    ap = argparse.ArgumentParser(description="Random SHIQ ontologies in OWL 2 functional syntax.")
    ap.add_argument("--seed", type=int, required=True, help="first seed")
    ap.add_argument("--count", type=int, default=1)
    ap.add_argument("--out", help="folder to write <seed>.ofn files into (else stdout)")
    a = ap.parse_args(argv)
    if a.out:
        os.makedirs(a.out, exist_ok=True)
    for s in range(a.seed, a.seed + a.count):
        text = generate(s)
        if a.out:
            path = os.path.join(a.out, "%d.ofn" % s)
            tmp = path + ".tmp"
            with open(tmp, "w", encoding="utf-8") as f:
                f.write(text)
            os.replace(tmp, path)
        else:
            sys.stdout.write(text)


if __name__ == "__main__":
    main(sys.argv[1:])
