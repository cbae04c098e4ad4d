#!/usr/bin/env python3
"""Seeded generator of random SROIQ ontologies in OWL 2 functional syntax (test tooling).

Modelled on scripts/gen_shiq.py, for differential testing of the SROIQ role constructs
against the oracle (docs/oracle.md): property chains, ObjectHasSelf (also negated),
reflexive, irreflexive, asymmetric and disjoint properties, sub-properties of inverses,
transitive and symmetric properties, qualified cardinalities, individuals with class and
property assertions, and, behind `--nominals`, ObjectHasValue and ObjectOneOf in the TBox.

One seed and one set of options give one ontology, byte for byte (Python's
`random.Random` with an integer seed; no set is iterated unsorted).

OWL 2 DL's global restrictions are kept (OWL 2 Structural Specification, section 11.2):

- Regular role hierarchy (Horrocks, Kutz & Sattler 2006): the properties get a random
  strict order (a rank each; a property and its inverse share it). Every
  SubObjectPropertyOf(r s) goes from a lower to a higher rank, and every chain
  r1 ... rn ⊑ s has one of the forms s s, s w, w s or w, with every element of w of a
  rank lower than s. InverseObjectProperties only joins properties that appear in no
  chain.
- Simple properties only where OWL 2 DL asks for them (number restrictions, functional
  and inverse-functional, irreflexive, asymmetric, disjoint properties, ObjectHasSelf).
  The properties are split into a simple pool (never transitive, never the super of a
  chain, only simple sub-properties) and a free pool; `check_simple` recomputes
  non-simplicity (transitive, or a chain or non-simple sub-property below, inverses
  included) and asserts the pools are right before anything is written.

With `--data` (SROIQ(D)): 1-3 data properties besides, whose class expressions
(DataSomeValuesFrom, DataAllValuesFrom, DataHasValue and qualified data cardinalities) mix
with the object constructs above, over the data ranges of scripts/gen_data.py (numbers with
interval facets, strings with length and pattern facets, booleans, dateTime with a
timezone, doubles, enumerations, complements, unions, intersections); functional data
properties, data ranges, domains and sub-data-properties; data assertions in the ABox; and,
with weight `key`, HasKey axioms over object and data properties. With weight `ddisjoint`, a
DisjointDataProperties axiom (at least two data properties then), and in most such files a
planted meeting of values of two disjoint properties at one individual: one literal, two
spellings of one value (`"2"^^xsd:integer` and `"2.0"^^xsd:decimal`, two time zones of one
instant) or two values that only look alike (`"1"^^xsd:integer` and `"1.0"^^xsd:double`), in
assertions or in class expressions, or counts over a small range.

Not generated: owl:topObjectProperty/bottomObjectProperty, datatype definitions.

Usage: gen_sroiq.py --seed S [--count N] [--out DIR] [--nominals] [--data] [--set KEY=W ...]
       (`--set chain=0` turns chains off; `--list` prints the weights and their defaults)
"""

import argparse
import os
import random
import sys

sys.path.insert(0, os.path.dirname(os.path.abspath(__file__)))
import gen_data  # noqa: E402

# Weights of the constructs (probabilities or relative weights, as named). `--set` overrides.
DEFAULTS = {
    "chain": 0.7,        # chance per free property of getting 1-2 chain axioms
    "transitive": 0.45,  # chance per free property of TransitiveObjectProperty
    "symmetric": 0.1,    # chance per property of SymmetricObjectProperty
    "reflexive": 0.08,   # chance per property of ReflexiveObjectProperty
    "irreflexive": 0.2,  # chance per simple property of IrreflexiveObjectProperty
    "asymmetric": 0.15,  # chance per simple property of AsymmetricObjectProperty
    "disjoint": 0.35,    # chance per ontology of one DisjointObjectProperties axiom
    "subprop": 1.0,      # mean number of SubObjectPropertyOf axioms per property
    "inverse_sub": 0.3,  # chance that a sub-property axiom has an inverse on the left
    "inverses": 0.25,    # chance per ontology of InverseObjectProperties
    "functional": 0.15,  # chance per simple property of (Inverse)FunctionalObjectProperty
    "self": 10,          # relative weight of ObjectHasSelf in class expressions
    "notself": 5,        # relative weight of ObjectComplementOf(ObjectHasSelf(..))
    "card": 12,          # relative weight of qualified/unqualified cardinalities
    "hasvalue": 8,       # relative weight of ObjectHasValue (only with --nominals)
    "oneof": 5,          # relative weight of ObjectOneOf (only with --nominals)
    "domain": 0.15,      # chance per property of ObjectPropertyDomain
    "range": 0.15,       # chance per property of ObjectPropertyRange
    "individuals": 0.4,  # chance per ontology of an ABox
    "planted": 0.4,      # chance per ontology of a planted SROIQ conflict
    # Only with --data:
    "data": 14,          # relative weight of each of the four data restrictions
    "dfunctional": 0.3,  # chance per data property of FunctionalDataProperty
    "drange": 0.25,      # chance per data property of DataPropertyRange
    "ddomain": 0.1,      # chance per data property of DataPropertyDomain
    "dsub": 0.4,         # chance per ontology of one SubDataPropertyOf
    "dassert": 1.0,      # mean number of data assertions per individual
    "key": 0.0,          # chance per ontology of a HasKey axiom (object and data properties)
    "abox": 1.0,         # 0 leaves out the random ABox (planted key assertions stay)
    "universal": 0,      # relative weight of ∃ and ∀ on owl:topObjectProperty (each)
    "ddisjoint": 0.0,    # chance per ontology of DisjointDataProperties (and planted meetings)
}

# Pairs of literals for planted meetings of disjoint data properties: one value written twice,
# or two values in different value spaces (OWL 2 Structural Specification §4).
LITERAL_TWINS = [
    ('"2"^^xsd:integer', '"2"^^xsd:integer'),
    ('"2"^^xsd:integer', '"02"^^xsd:integer'),
    ('"2"^^xsd:integer', '"2.0"^^xsd:decimal'),
    ('"1"^^xsd:integer', '"1.0"^^xsd:double'),
    ('"1"^^xsd:integer', '"1"'),
    ('"a"', '"a"^^xsd:string'),
    ('"a"', '"a"@en'),
    ('"true"^^xsd:boolean', '"1"^^xsd:boolean'),
    ('"2020-01-01T00:00:00Z"^^xsd:dateTime', '"2020-01-01T01:00:00+01:00"^^xsd:dateTime'),
    ('"0F"^^xsd:hexBinary', '"0f"^^xsd:hexBinary'),
]

# Small ranges for planted counts over disjoint properties.
SMALL_RANGES = [
    "xsd:boolean",
    'DataOneOf("a" "b" "c")',
    "DatatypeRestriction(xsd:integer xsd:minInclusive \"1\"^^xsd:integer xsd:maxInclusive \"3\"^^xsd:integer)",
    "DatatypeRestriction(xsd:integer xsd:minInclusive \"1\"^^xsd:integer xsd:maxInclusive \"4\"^^xsd:integer)",
]


class Gen:
    """State of one ontology under construction."""

    def __init__(self, seed, nominals=False, weights=None, data=False):
        self.seed = seed
        self.nominals = nominals
        self.data = data
        self.w = dict(DEFAULTS)
        self.w.update(weights or {})
        self.rng = random.Random(seed)
        rng = self.rng
        size = rng.choices(["tiny", "small", "medium"], [30, 45, 25])[0]
        lo, hi = {"tiny": (2, 5), "small": (5, 12), "medium": (12, 22)}[size]
        self.n_classes = rng.randint(lo, hi)
        self.classes = [":C%d" % i for i in range(self.n_classes)]
        n_props = rng.randint(2, min(6, 2 + self.n_classes // 3))
        self.props = [":r%d" % i for i in range(n_props)]
        order = list(self.props)
        rng.shuffle(order)
        self.rank = {p: i for i, p in enumerate(order)}
        self.simple = set(p for p in self.props if rng.random() < 0.5)
        if not self.simple:
            self.simple.add(self.props[0])
        if len(self.simple) == len(self.props):
            self.simple.discard(self.props[-1])
        want_abox = rng.random() < self.w["individuals"] or nominals
        n_ind = rng.randint(2, 5) if want_abox else 0
        self.inds = [":i%d" % i for i in range(n_ind)]
        self.axioms = []
        self.role_edges = []   # ((sub, inv?), (sup, inv?)) simple inclusions
        self.chain_sups = set()
        self.chain_list = []   # (elements, super) of each chain axiom
        self.in_chain = set()
        self.transitive = set()
        self.max_depth = rng.choice([1, 2, 2, 3])
        # Drawn last, and only with --data, so that the other modes stay byte-identical.
        self.dprops = [":d%d" % i for i in range(rng.randint(1, 3))] if data else []
        if data and self.w["ddisjoint"] > 0 and len(self.dprops) < 2:
            self.dprops.append(":d1")
        self.ddisjoint = []

    def free(self):
        return [p for p in self.props if p not in self.simple]

    # ---- roles -------------------------------------------------------------------------

    def inv(self, p):
        return "ObjectInverseOf(%s)" % p

    def role(self, simple_only=False):
        pool = sorted(self.simple) if simple_only else self.props
        p = self.rng.choice(pool)
        return self.inv(p) if self.rng.random() < 0.25 else p

    def maybe_inv(self, p):
        return self.inv(p) if self.rng.random() < 0.25 else p

    def chains(self):
        """Regular chains r1..rn ⊑ s, of the forms s s, s w, w s, w (w below s)."""
        rng = self.rng
        for s in self.free():
            if rng.random() >= self.w["chain"]:
                continue
            below = [p for p in self.props if self.rank[p] < self.rank[s]]
            for _ in range(rng.choice([1, 1, 2])):
                forms = ["ss"] + (["sw", "ws", "w"] if below else [])
                form = rng.choices(forms, [1, 3, 3, 3][: len(forms)])[0]
                if form == "ss":
                    elems = [s, s]
                else:
                    n = rng.choice([1, 1, 2]) if form != "w" else rng.choice([2, 2, 3])
                    w = [self.maybe_inv(rng.choice(below)) for _ in range(n)]
                    elems = [s] + w if form == "sw" else w + [s] if form == "ws" else w
                self.chain_sups.add(s)
                self.chain_list.append((elems, s))
                for e in elems:
                    self.in_chain.add(e.replace("ObjectInverseOf(", "").rstrip(")"))
                self.axioms.append("SubObjectPropertyOf(ObjectPropertyChain(%s) %s)"
                                   % (" ".join(elems), s))

    def rbox(self):
        rng = self.rng
        for p in self.free():
            if rng.random() < self.w["transitive"]:
                self.transitive.add(p)
                self.axioms.append("TransitiveObjectProperty(%s)" % p)
        self.chains()
        n_sub = int(round(self.w["subprop"] * len(self.props) * rng.random() * 2))
        for _ in range(n_sub):
            sub, sup = rng.sample(self.props, 2)
            if self.rank[sub] > self.rank[sup]:
                sub, sup = sup, sub
            # A simple property's sub-properties must be simple too.
            if sup in self.simple and sub not in self.simple:
                continue
            inv = rng.random() < self.w["inverse_sub"]
            self.role_edges.append(((sub, inv), (sup, False)))
            self.axioms.append("SubObjectPropertyOf(%s %s)" % (self.inv(sub) if inv else sub, sup))
        plain = [p for p in self.props if p not in self.in_chain and p not in self.chain_sups]
        if len(plain) >= 2 and rng.random() < self.w["inverses"]:
            p, q = rng.sample(plain, 2)
            if (p in self.simple) == (q in self.simple):
                self.role_edges.append(((p, False), (q, True)))
                self.role_edges.append(((q, True), (p, False)))
                self.axioms.append("InverseObjectProperties(%s %s)" % (p, q))
        for p in self.props:
            if rng.random() < self.w["symmetric"]:
                self.role_edges.append(((p, False), (p, True)))
                self.axioms.append("SymmetricObjectProperty(%s)" % p)
            if rng.random() < self.w["reflexive"]:
                self.axioms.append("ReflexiveObjectProperty(%s)" % p)
        for p in sorted(self.simple):
            if rng.random() < self.w["irreflexive"]:
                self.axioms.append("IrreflexiveObjectProperty(%s)" % p)
            if rng.random() < self.w["asymmetric"]:
                self.axioms.append("AsymmetricObjectProperty(%s)" % p)
            if rng.random() < self.w["functional"]:
                self.axioms.append("FunctionalObjectProperty(%s)" % p)
            if rng.random() < self.w["functional"] * 0.6:
                self.axioms.append("InverseFunctionalObjectProperty(%s)" % p)
        simple = sorted(self.simple)
        if len(simple) >= 2 and rng.random() < self.w["disjoint"]:
            ps = rng.sample(simple, min(len(simple), rng.choice([2, 2, 3])))
            self.axioms.append("DisjointObjectProperties(%s)"
                               % " ".join(self.maybe_inv(p) for p in ps))
        for p in self.props:
            if rng.random() < self.w["domain"]:
                self.axioms.append("ObjectPropertyDomain(%s %s)" % (p, self.expr(1)))
            if rng.random() < self.w["range"]:
                self.axioms.append("ObjectPropertyRange(%s %s)" % (p, self.expr(1)))

    def check_simple(self):
        """Recomputes the non-simple properties and asserts the simple pool has none."""
        edges = set()
        for (a, ai), (b, bi) in self.role_edges:
            edges.add(((a, ai), (b, bi)))
            edges.add(((a, not ai), (b, not bi)))  # r ⊑ s implies r⁻ ⊑ s⁻
        base = self.transitive | self.chain_sups
        non_simple = set((p, i) for p in base for i in (False, True))
        changed = True
        while changed:
            changed = False
            for a, b in sorted(edges):
                if a in non_simple and b not in non_simple:
                    non_simple.add(b)
                    changed = True
        for p in self.simple:
            assert (p, False) not in non_simple and (p, True) not in non_simple, (self.seed, p)
        for (a, _), (b, _) in self.role_edges:
            assert a == b or self.rank[a] < self.rank[b] or (a not in self.in_chain | self.chain_sups
                                                   and b not in self.in_chain | self.chain_sups)

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
        kinds = ["and", "or", "not", "some", "all", "card", "self", "notself"]
        weights = [14, 9, 5, 22, 12, self.w["card"], self.w["self"], self.w["notself"]]
        if self.nominals and self.inds:
            kinds += ["hasvalue", "oneof"]
            weights += [self.w["hasvalue"], self.w["oneof"]]
        if self.data:
            kinds += ["dsome", "dall", "dvalue", "dcard"]
            weights += [self.w["data"]] * 4
        if self.w["universal"]:
            kinds += ["usome", "uall"]
            weights += [self.w["universal"]] * 2
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
        if k == "usome":
            return "ObjectSomeValuesFrom(owl:topObjectProperty %s)" % sub()
        if k == "uall":
            return "ObjectAllValuesFrom(owl:topObjectProperty %s)" % sub()
        if k == "self":
            return "ObjectHasSelf(%s)" % self.role(simple_only=True)
        if k == "notself":
            return "ObjectComplementOf(ObjectHasSelf(%s))" % self.role(simple_only=True)
        if k == "hasvalue":
            return "ObjectHasValue(%s %s)" % (self.role(), rng.choice(self.inds))
        if k in ("dsome", "dall", "dvalue", "dcard"):
            return self.data_expr(k)
        if k == "oneof":
            return "ObjectOneOf(%s)" % " ".join(rng.sample(self.inds, rng.randint(1, min(3, len(self.inds)))))
        name = rng.choice(["ObjectMinCardinality", "ObjectMaxCardinality", "ObjectMaxCardinality",
                           "ObjectExactCardinality"])
        n = rng.choices([0, 1, 2, 3], [5, 40, 40, 15])[0]
        if rng.random() < 0.2:
            return "%s(%d %s)" % (name, n, self.role(simple_only=True))
        return "%s(%d %s %s)" % (name, n, self.role(simple_only=True), sub())

    def data_expr(self, k):
        rng = self.rng
        d = rng.choice(self.dprops)
        if k == "dsome":
            return "DataSomeValuesFrom(%s %s)" % (d, gen_data.data_range(rng))
        if k == "dall":
            return "DataAllValuesFrom(%s %s)" % (d, gen_data.data_range(rng))
        if k == "dvalue":
            return "DataHasValue(%s %s)" % (d, rng.choice(gen_data.LITERALS))
        name = rng.choice(["DataMinCardinality", "DataMaxCardinality", "DataExactCardinality"])
        n = rng.choices([0, 1, 2, 3], [5, 45, 35, 15])[0]
        if rng.random() < 0.2:
            return "%s(%d %s)" % (name, n, d)
        return "%s(%d %s %s)" % (name, n, d, gen_data.data_range(rng))

    def data_axioms(self):
        """Data property axioms and, with weight `key`, a key over object and data properties."""
        rng = self.rng
        for d in self.dprops:
            if rng.random() < self.w["dfunctional"]:
                self.axioms.append("FunctionalDataProperty(%s)" % d)
            if rng.random() < self.w["drange"]:
                self.axioms.append("DataPropertyRange(%s %s)" % (d, gen_data.data_range(rng, 1)))
            if rng.random() < self.w["ddomain"]:
                self.axioms.append("DataPropertyDomain(%s %s)" % (d, self.expr(1)))
        if len(self.dprops) >= 2 and rng.random() < self.w["dsub"]:
            a, b = rng.sample(self.dprops, 2)
            self.axioms.append("SubDataPropertyOf(%s %s)" % (a, b))
        if self.w["ddisjoint"] and rng.random() < self.w["ddisjoint"]:
            self.disjoint_data()
        if rng.random() < self.w["key"]:
            c = self.expr(1) if rng.random() < 0.3 else rng.choice(self.classes)
            # Keys take simple object properties (as wherefore asks) and data properties.
            rs = rng.sample(sorted(self.simple), rng.choice([0, 0, 1]))
            ds = rng.sample(self.dprops, rng.randint(1 if not rs else 0, min(2, len(self.dprops))))
            self.axioms.append("HasKey(%s (%s) (%s))" % (c, " ".join(rs), " ".join(ds)))
            self.key = (c, rs, ds)

    def disjoint_data(self):
        """DisjointDataProperties over two or three data properties and, in most files, values
        of two of them planted to meet at one element of a class (the ABox ones come later)."""
        rng = self.rng
        ds = rng.sample(self.dprops, min(len(self.dprops), rng.choice([2, 2, 3])))
        self.ddisjoint = ds
        self.axioms.append("DisjointDataProperties(%s)" % " ".join(ds))
        if self.n_classes < 1 or rng.random() >= 0.6:
            return
        p, q = rng.sample(ds, 2)
        c = rng.choice(self.classes)
        t = rng.randint(0, 2)
        if t == 0:  # two literals that may be one value
            v, w = rng.choice(LITERAL_TWINS)
            self.axioms.append("SubClassOf(%s ObjectIntersectionOf(DataHasValue(%s %s) DataHasValue(%s %s)))"
                               % (c, p, v, q, w))
        elif t == 1:  # a value against a range that may hold it
            v, w = rng.choice(LITERAL_TWINS)
            r = rng.choice(["DataOneOf(%s)" % w, "DataOneOf(%s %s)" % (w, rng.choice(gen_data.LITERALS)),
                            gen_data.data_range(rng)])
            self.axioms.append("SubClassOf(%s DataHasValue(%s %s))" % (c, p, v))
            self.axioms.append("SubClassOf(%s DataSomeValuesFrom(%s %s))" % (c, q, r))
        else:  # counts over a small range: n + m values, none shared
            r = rng.choice(SMALL_RANGES)
            n, m = rng.randint(1, 2), rng.randint(1, 2)
            self.axioms.append("SubClassOf(%s ObjectIntersectionOf(DataMinCardinality(%d %s %s) "
                               "DataMinCardinality(%d %s %s)))" % (c, n, p, r, m, q, r))

    def data_abox(self):
        rng = self.rng
        if len(self.ddisjoint) >= 2 and self.inds and rng.random() < 0.6:
            p, q = rng.sample(self.ddisjoint, 2)
            v, w = rng.choice(LITERAL_TWINS)
            a = rng.choice(self.inds)
            self.axioms.append("DataPropertyAssertion(%s %s %s)" % (p, a, v))
            self.axioms.append("DataPropertyAssertion(%s %s %s)" % (q, a, w))
        if getattr(self, "key", None) and len(self.inds) >= 2 and rng.random() < 0.7:
            self.planted_key()
        for a in self.inds:
            for _ in range(int(rng.random() * 2 * self.w["dassert"] + 0.5)):
                self.axioms.append("DataPropertyAssertion(%s %s %s)"
                                   % (rng.choice(self.dprops), a, rng.choice(gen_data.LITERALS)))

    def planted_key(self):
        """Two individuals in the key's class that share the key's fillers and values (the
        value asserted, or forced by a one-value range), one of them in a class the other is
        not in: the key decides whether that clashes."""
        rng = self.rng
        c, rs, ds = self.key
        a, b = rng.sample(self.inds, 2)
        self.axioms.append("ClassAssertion(%s %s)" % (c, a))
        self.axioms.append("ClassAssertion(%s %s)" % (c, b))
        for r in rs:
            k = rng.choice(self.inds)
            self.axioms.append("ObjectPropertyAssertion(%s %s %s)" % (r, a, k))
            self.axioms.append("ObjectPropertyAssertion(%s %s %s)" % (r, b, k))
        for d in ds:
            v = rng.choice(gen_data.LITERALS)
            self.axioms.append("DataPropertyAssertion(%s %s %s)" % (d, a, v))
            form = rng.random()
            if form < 0.4:
                self.axioms.append("DataPropertyAssertion(%s %s %s)" % (d, b, v))
            elif form < 0.7:
                self.axioms.append("ClassAssertion(DataSomeValuesFrom(%s DataOneOf(%s)) %s)" % (d, v, b))
            else:  # a value of a random range, which may or may not meet a's
                self.axioms.append("ClassAssertion(DataSomeValuesFrom(%s %s) %s)"
                                   % (d, gen_data.data_range(rng), b))
        x = rng.choice(self.classes)
        self.axioms.append("ClassAssertion(%s %s)" % (x, a))
        self.axioms.append("ClassAssertion(ObjectComplementOf(%s) %s)" % (x, b))

    def tbox(self):
        rng = self.rng
        n = self.n_classes
        for _ in range(rng.randint(max(1, n // 2), int(n * 1.3) + 2)):
            k = rng.choices(["sub", "subrev", "gci", "equiv", "disj"], [52, 8, 5, 16, 10])[0]
            c = rng.choice(self.classes)
            if k == "sub":
                self.axioms.append("SubClassOf(%s %s)" % (c, self.expr(rng.randint(1, self.max_depth))))
            elif k == "subrev":
                self.axioms.append("SubClassOf(%s %s)" % (self.expr(rng.randint(1, 2)), c))
            elif k == "gci":
                self.axioms.append("SubClassOf(%s %s)" % (self.expr(1), self.expr(rng.randint(1, 2))))
            elif k == "equiv":
                self.axioms.append("EquivalentClasses(%s %s)" % (c, self.expr(rng.randint(1, self.max_depth))))
            elif k == "disj" and n >= 2:
                cs = rng.sample(self.classes, min(n, rng.choice([2, 2, 3])))
                self.axioms.append("DisjointClasses(%s)" % " ".join(cs))
        self.planted()

    def planted(self):
        """Planted SROIQ conflicts or entailments, so that the new constructs decide answers."""
        rng = self.rng
        if self.n_classes < 2 or rng.random() >= self.w["planted"]:
            return
        a, b = rng.sample(self.classes, 2)
        s = rng.choice(sorted(self.simple))
        t = rng.randint(0, 4)
        if t == 0:   # a chain makes a value restriction reach along the whole chain
            if self.chain_list:
                elems, sup = rng.choice(self.chain_list)
                e = b
                for r in reversed(elems):
                    e = "ObjectSomeValuesFrom(%s %s)" % (r, e)
                self.axioms.append("SubClassOf(%s %s)" % (a, e))
                self.axioms.append("SubClassOf(%s ObjectAllValuesFrom(%s %s))"
                                   % (a, sup, rng.choice(["ObjectComplementOf(%s)" % b,
                                                          rng.choice(self.classes)])))
        elif t == 1:  # self loop against irreflexivity or asymmetry
            self.axioms.append("SubClassOf(%s ObjectHasSelf(%s))" % (a, s))
            self.axioms.append(rng.choice(["IrreflexiveObjectProperty(%s)" % s,
                                           "AsymmetricObjectProperty(%s)" % s,
                                           "SubClassOf(%s ObjectAllValuesFrom(%s %s))" % (a, s, b)]))
        elif t == 2:  # reflexive property meets a value restriction
            p = rng.choice(self.props)
            self.axioms.append("ReflexiveObjectProperty(%s)" % p)
            self.axioms.append("SubClassOf(%s ObjectAllValuesFrom(%s %s))" % (a, p, b))
        elif t == 3:  # disjoint properties sharing an edge
            simple = sorted(self.simple)
            if len(simple) >= 2:
                p, q = rng.sample(simple, 2)
                self.axioms.append("DisjointObjectProperties(%s %s)" % (p, q))
                self.axioms.append("SubClassOf(%s ObjectSomeValuesFrom(%s ObjectHasSelf(%s)))" % (a, p, q))
        else:  # a Self loop read through an existential
            self.axioms.append("EquivalentClasses(%s ObjectHasSelf(%s))" % (a, s))
            self.axioms.append("SubClassOf(%s ObjectSomeValuesFrom(%s %s))" % (b, s, a))

    def abox(self):
        rng = self.rng
        if not self.inds or not self.w["abox"]:
            return
        for _ in range(rng.randint(1, 2 * len(self.inds))):
            k = rng.choices(["cls", "prop", "self", "neg", "diff"], [30, 40, 8, 5, 8])[0]
            a = rng.choice(self.inds)
            if k == "cls":
                e = self.expr(1) if rng.random() < 0.3 else rng.choice(self.classes)
                self.axioms.append("ClassAssertion(%s %s)" % (e, a))
            elif k == "prop":
                self.axioms.append("ObjectPropertyAssertion(%s %s %s)" % (rng.choice(self.props), a, rng.choice(self.inds)))
            elif k == "self":
                self.axioms.append("ObjectPropertyAssertion(%s %s %s)" % (rng.choice(self.props), a, a))
            elif k == "neg":
                self.axioms.append("NegativeObjectPropertyAssertion(%s %s %s)" % (rng.choice(self.props), a, rng.choice(self.inds)))
            elif k == "diff" and len(self.inds) >= 2:
                self.axioms.append("DifferentIndividuals(%s)" % " ".join(rng.sample(self.inds, 2)))

    def render(self):
        self.rbox()
        self.check_simple()
        self.tbox()
        if self.data:
            self.data_axioms()
        self.abox()
        if self.data:
            self.data_abox()
        base = "http://example.org/sroiq/%d%s%s" % (self.seed, "n" if self.nominals else "",
                                                    "d" if self.data else "")
        out = [
            "Prefix(:=<%s#>)" % base,
            "Prefix(owl:=<http://www.w3.org/2002/07/owl#>)",
            "Prefix(rdf:=<http://www.w3.org/1999/02/22-rdf-syntax-ns#>)",
            "Prefix(rdfs:=<http://www.w3.org/2000/01/rdf-schema#>)",
            "Prefix(xsd:=<http://www.w3.org/2001/XMLSchema#>)",
            "",
            "Ontology(<%s>" % base,
        ]
        out += ["Declaration(Class(%s))" % c for c in self.classes]
        out += ["Declaration(ObjectProperty(%s))" % p for p in self.props]
        out += ["Declaration(DataProperty(%s))" % d for d in self.dprops]
        out += ["Declaration(NamedIndividual(%s))" % i for i in self.inds]
        out += self.axioms
        out.append(")")
        return "\n".join(out) + "\n"


def generate(seed, nominals=False, weights=None, data=False):
    """The ontology for `seed` (and options), as functional-syntax text."""
    return Gen(seed, nominals, weights, data).render()


def parse_sets(items):
    """`KEY=W` overrides of DEFAULTS, checked against the known keys."""
    out = {}
    for it in items or []:
        k, _, v = it.partition("=")
        if k not in DEFAULTS:
            raise SystemExit("gen_sroiq: unknown weight %r (known: %s)" % (k, ", ".join(sorted(DEFAULTS))))
        out[k] = float(v)
    return out


def main(argv):
    ap = argparse.ArgumentParser(description="Random SROIQ ontologies in OWL 2 functional syntax.")
    ap.add_argument("--seed", type=int)
    ap.add_argument("--count", type=int, default=1)
    ap.add_argument("--out", help="folder to write <seed>.ofn files into (else stdout)")
    ap.add_argument("--nominals", action="store_true", help="ObjectHasValue and ObjectOneOf in the TBox")
    ap.add_argument("--data", action="store_true", help="data properties and data ranges besides (SROIQ(D))")
    ap.add_argument("--set", action="append", metavar="KEY=W", help="override a weight")
    ap.add_argument("--list", action="store_true", help="print the weights and exit")
    a = ap.parse_args(argv)
    if a.list:
        for k in sorted(DEFAULTS):
            print("%s=%s" % (k, DEFAULTS[k]))
        return
    if a.seed is None:
        ap.error("--seed is required")
    weights = parse_sets(a.set)
    if a.out:
        os.makedirs(a.out, exist_ok=True)
    for s in range(a.seed, a.seed + a.count):
        text = generate(s, a.nominals, weights, a.data)
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
