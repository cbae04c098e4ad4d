#!/usr/bin/env python3
"""Random ontologies over the OWL 2 datatype map, for differential testing of the data
ranges against the oracle (`scripts/oracle-diff --files ...`). Test tooling only.

    scripts/gen_data.py --seed S [--count N] [--out DIR]

Each file declares 4-10 classes and 1-3 data properties (sub-properties, functional
properties, ranges) and defines classes with DataSomeValuesFrom, DataAllValuesFrom,
DataHasValue and qualified data cardinalities over: integers, decimals and rationals with
interval facets, strings with length and pattern facets, booleans, dateTime values with a
timezone, doubles, anyURI, hexBinary, language-tagged strings, enumerations of literals of
all these, and their complements, unions and intersections. An ABox of 1-3 individuals
asserts classes and literals. dateTime literals always carry a timezone (the oracle and XSD
1.1 differ on values without one), and no literal is ill-typed (the oracle refuses them).
"""

import argparse
import os
import random

XSD = "xsd:"

LITERALS = [
    '"1"^^xsd:integer',
    '"2"^^xsd:integer',
    '"-3"^^xsd:integer',
    '"2.5"^^xsd:decimal',
    '"2.0"^^xsd:decimal',
    '"1/3"^^owl:rational',
    '"a"',
    '"ab"',
    '"ba"',
    '"abc"',
    '"a"@en',
    '"true"^^xsd:boolean',
    '"false"^^xsd:boolean',
    '"2020-01-01T00:00:00Z"^^xsd:dateTime',
    '"2020-01-01T01:00:00+01:00"^^xsd:dateTime',
    '"2021-06-01T12:30:00Z"^^xsd:dateTime',
    '"1.0"^^xsd:double',
    '"0F"^^xsd:hexBinary',
    '"http://example.org/x"^^xsd:anyURI',
]

NAMED = [
    "xsd:integer",
    "xsd:decimal",
    "owl:rational",
    "owl:real",
    "xsd:nonNegativeInteger",
    "xsd:byte",
    "xsd:string",
    "xsd:token",
    "xsd:boolean",
    "xsd:dateTime",
    "xsd:dateTimeStamp",
    "xsd:double",
    "xsd:anyURI",
    "xsd:hexBinary",
    "rdf:PlainLiteral",
    "rdfs:Literal",
]

PATTERNS = ["[ab]*", "a+b?", "(ab|ba)", "[a-c]{2}", "b.*", "[^a]*"]
DATES = ["2020-01-01T00:00:00Z", "2020-06-01T00:00:00+02:00", "2021-01-01T00:00:00Z"]


def facet_range(rnd):
    """A datatype restriction with facets: numbers, strings, dateTime or double."""
    k = rnd.random()
    if k < 0.3:
        lo, hi = sorted(rnd.sample(range(-3, 6), 2))
        f1 = rnd.choice(["minInclusive", "minExclusive"])
        f2 = rnd.choice(["maxInclusive", "maxExclusive"])
        dt = rnd.choice(["xsd:integer", "xsd:decimal", "owl:rational"])
        parts = []
        if rnd.random() < 0.8:
            parts.append('xsd:%s "%d"^^xsd:integer' % (f1, lo))
        if rnd.random() < 0.8 or not parts:
            parts.append('xsd:%s "%s"^^xsd:decimal' % (f2, hi if rnd.random() < 0.7 else "%d.5" % hi))
        return "DatatypeRestriction(%s %s)" % (dt, " ".join(parts))
    if k < 0.65:
        parts = []
        if rnd.random() < 0.6:
            f = rnd.choice(["length", "minLength", "maxLength"])
            parts.append('xsd:%s "%d"^^xsd:nonNegativeInteger' % (f, rnd.randint(0, 3)))
        if rnd.random() < 0.6 or not parts:
            parts.append('xsd:pattern "%s"' % rnd.choice(PATTERNS))
        return "DatatypeRestriction(xsd:string %s)" % " ".join(parts)
    if k < 0.85:
        f = rnd.choice(["minInclusive", "minExclusive", "maxInclusive", "maxExclusive"])
        return 'DatatypeRestriction(xsd:dateTime xsd:%s "%s"^^xsd:dateTime)' % (
            f,
            rnd.choice(DATES),
        )
    f = rnd.choice(["minInclusive", "maxExclusive"])
    return 'DatatypeRestriction(xsd:double xsd:%s "%s"^^xsd:double)' % (
        f,
        rnd.choice(["0.0", "1.5", "-2.0"]),
    )

def data_range(rnd, depth=0):
    """A random data range of the datatype map (also used by gen_sroiq.py --data)."""
    k = rnd.random()
    if depth > 1 or k < 0.25:
        return rnd.choice(NAMED)
    if k < 0.55:
        return facet_range(rnd)
    if k < 0.7:
        return "DataOneOf(%s)" % " ".join(rnd.sample(LITERALS, rnd.randint(1, 3)))
    if k < 0.8:
        return "DataComplementOf(%s)" % data_range(rnd, depth + 1)
    if k < 0.9:
        return "DataUnionOf(%s %s)" % (data_range(rnd, depth + 1), data_range(rnd, depth + 1))
    return "DataIntersectionOf(%s %s)" % (data_range(rnd, depth + 1), data_range(rnd, depth + 1))


def gen(seed):
    rnd = random.Random(seed)
    ns = "http://example.org/data/%d#" % seed
    classes = [":C%d" % i for i in range(rnd.randint(4, 10))]
    props = [":d%d" % i for i in range(rnd.randint(1, 3))]
    inds = [":i%d" % i for i in range(rnd.randint(1, 3))]
    ax = []

    def ce(depth=0):
        k = rnd.random()
        p = rnd.choice(props)
        if depth > 1 or k < 0.2:
            return rnd.choice(classes)
        if k < 0.4:
            return "DataSomeValuesFrom(%s %s)" % (p, data_range(rnd))
        if k < 0.5:
            return "DataAllValuesFrom(%s %s)" % (p, data_range(rnd))
        if k < 0.6:
            return "DataHasValue(%s %s)" % (p, rnd.choice(LITERALS))
        if k < 0.75:
            kind = rnd.choice(["DataMinCardinality", "DataMaxCardinality", "DataExactCardinality"])
            return "%s(%d %s %s)" % (kind, rnd.randint(0, 3), p, data_range(rnd))
        if k < 0.83:
            return "ObjectComplementOf(%s)" % ce(depth + 1)
        if k < 0.92:
            return "ObjectIntersectionOf(%s %s)" % (ce(depth + 1), ce(depth + 1))
        return "ObjectUnionOf(%s %s)" % (ce(depth + 1), ce(depth + 1))

    for _ in range(rnd.randint(4, 12)):
        k = rnd.random()
        if k < 0.45:
            ax.append("SubClassOf(%s %s)" % (rnd.choice(classes), ce()))
        elif k < 0.75:
            ax.append("EquivalentClasses(%s %s)" % (rnd.choice(classes), ce()))
        elif k < 0.85:
            ax.append("SubClassOf(%s %s)" % (ce(), rnd.choice(classes)))
        else:
            a, b = rnd.sample(classes, 2)
            ax.append("DisjointClasses(%s %s)" % (a, b))
    for p in props:
        r = rnd.random()
        if r < 0.25:
            ax.append("FunctionalDataProperty(%s)" % p)
        elif r < 0.5:
            ax.append("DataPropertyRange(%s %s)" % (p, data_range(rnd, 1)))
    if len(props) > 1 and rnd.random() < 0.5:
        a, b = rnd.sample(props, 2)
        ax.append("SubDataPropertyOf(%s %s)" % (a, b))
    for i in inds:
        if rnd.random() < 0.7:
            ax.append("ClassAssertion(%s %s)" % (rnd.choice(classes), i))
        for _ in range(rnd.randint(0, 2)):
            ax.append("DataPropertyAssertion(%s %s %s)" % (rnd.choice(props), i, rnd.choice(LITERALS)))

    decl = ["Declaration(Class(%s))" % c for c in classes]
    decl += ["Declaration(DataProperty(%s))" % p for p in props]
    decl += ["Declaration(NamedIndividual(%s))" % i for i in inds]
    return "Prefix(:=<%s>)\nOntology(<%s>\n%s\n)\n" % (
        ns,
        ns.rstrip("#"),
        "\n".join(decl + ax),
    )


def main():
    ap = argparse.ArgumentParser()
    ap.add_argument("--seed", type=int, required=True)
    ap.add_argument("--count", type=int, default=1)
    ap.add_argument("--out", default=".")
    a = ap.parse_args()
    os.makedirs(a.out, exist_ok=True)
    for s in range(a.seed, a.seed + a.count):
        with open(os.path.join(a.out, "data-%04d.ofn" % s), "w") as f:
            f.write(gen(s))


if __name__ == "__main__":
    main()
