//! RCC-8 (Randell, Cui & Cohn 1992) on digital regions, and its composition table
//! (Cohn, Bennett, Gooday & Gotts 1997, "Qualitative spatial representation and reasoning
//! with the region connection calculus", GeoInformatica 1(3), Table 2).
//!
//! Discrete definitions, for non-empty voxel sets A and B and an adjacency (6 or 26):
//! - A and B are *connected* when they share a voxel or a voxel of A is adjacent to one of B;
//! - DC: not connected; EC: connected, no shared voxel; PO: shared voxels, neither a subset;
//! - EQ: same voxels; TPP: A ⊊ B and some voxel of A is adjacent to a voxel outside B;
//!   NTPP: A ⊊ B and no voxel of A is adjacent to a voxel outside B; TPPi, NTPPi: converses.

use super::mask::{Adjacency, Mask};

/// The eight base relations.
#[derive(Clone, Copy, Debug, PartialEq, Eq, PartialOrd, Ord, Hash)]
pub enum Rcc8 {
    /// Disconnected.
    DC,
    /// Externally connected.
    EC,
    /// Partial overlap.
    PO,
    /// Tangential proper part.
    TPP,
    /// Non-tangential proper part.
    NTPP,
    /// Inverse of TPP.
    TPPi,
    /// Inverse of NTPP.
    NTPPi,
    /// Equal.
    EQ,
}

impl Rcc8 {
    /// All eight, in table order.
    pub const ALL: [Rcc8; 8] = [
        Rcc8::DC,
        Rcc8::EC,
        Rcc8::PO,
        Rcc8::TPP,
        Rcc8::NTPP,
        Rcc8::TPPi,
        Rcc8::NTPPi,
        Rcc8::EQ,
    ];

    /// The relation name of the facts file.
    pub fn relation(self) -> &'static str {
        match self {
            Rcc8::DC => "rcc8_DC",
            Rcc8::EC => "rcc8_EC",
            Rcc8::PO => "rcc8_PO",
            Rcc8::TPP => "rcc8_TPP",
            Rcc8::NTPP => "rcc8_NTPP",
            Rcc8::TPPi => "rcc8_TPPi",
            Rcc8::NTPPi => "rcc8_NTPPi",
            Rcc8::EQ => "rcc8_EQ",
        }
    }

    /// The converse relation: R(a, b) ⇔ converse(R)(b, a).
    pub fn converse(self) -> Rcc8 {
        match self {
            Rcc8::TPP => Rcc8::TPPi,
            Rcc8::NTPP => Rcc8::NTPPi,
            Rcc8::TPPi => Rcc8::TPP,
            Rcc8::NTPPi => Rcc8::NTPP,
            r => r,
        }
    }

    fn bit(self) -> u8 {
        1 << (self as u8)
    }
}

/// A set of RCC-8 relations as a bit set (bit i = `Rcc8::ALL[i]`).
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub struct Rcc8Set(pub u8);

impl Rcc8Set {
    /// Whether the set holds `r`.
    pub fn contains(self, r: Rcc8) -> bool {
        self.0 & r.bit() != 0
    }

    /// The relations in the set.
    pub fn members(self) -> Vec<Rcc8> {
        Rcc8::ALL
            .into_iter()
            .filter(|r| self.contains(*r))
            .collect()
    }

    /// The set of converses.
    pub fn converse(self) -> Rcc8Set {
        Rcc8Set(
            self.members()
                .into_iter()
                .fold(0, |acc, r| acc | r.converse().bit()),
        )
    }
}

const fn set(rs: &[Rcc8]) -> Rcc8Set {
    let mut b = 0u8;
    let mut i = 0;
    while i < rs.len() {
        b |= 1 << (rs[i] as u8);
        i += 1;
    }
    Rcc8Set(b)
}

use Rcc8::*;
const ALL8: Rcc8Set = Rcc8Set(0xff);
const DR_PP: Rcc8Set = set(&[DC, EC, PO, TPP, NTPP]);
const DR_PPI: Rcc8Set = set(&[DC, EC, PO, TPPi, NTPPi]);
const PO_PP: Rcc8Set = set(&[PO, TPP, NTPP]);
const PO_PPI: Rcc8Set = set(&[PO, TPPi, NTPPi]);

/// The composition table, rows R(a,b), columns S(b,c), order DC EC PO TPP NTPP TPPi NTPPi EQ
/// (Cohn et al. 1997, Table 2).
const TABLE: [[Rcc8Set; 8]; 8] = [
    // DC
    [
        ALL8,
        DR_PP,
        DR_PP,
        DR_PP,
        DR_PP,
        set(&[DC]),
        set(&[DC]),
        set(&[DC]),
    ],
    // EC
    [
        DR_PPI,
        set(&[DC, EC, PO, TPP, TPPi, EQ]),
        DR_PP,
        set(&[EC, PO, TPP, NTPP]),
        PO_PP,
        set(&[DC, EC]),
        set(&[DC]),
        set(&[EC]),
    ],
    // PO
    [
        DR_PPI,
        DR_PPI,
        ALL8,
        PO_PP,
        PO_PP,
        DR_PPI,
        DR_PPI,
        set(&[PO]),
    ],
    // TPP
    [
        set(&[DC]),
        set(&[DC, EC]),
        DR_PP,
        set(&[TPP, NTPP]),
        set(&[NTPP]),
        set(&[DC, EC, PO, TPP, TPPi, EQ]),
        DR_PPI,
        set(&[TPP]),
    ],
    // NTPP
    [
        set(&[DC]),
        set(&[DC]),
        DR_PP,
        set(&[NTPP]),
        set(&[NTPP]),
        DR_PP,
        ALL8,
        set(&[NTPP]),
    ],
    // TPPi
    [
        DR_PPI,
        set(&[EC, PO, TPPi, NTPPi]),
        PO_PPI,
        set(&[PO, TPP, TPPi, EQ]),
        PO_PP,
        set(&[TPPi, NTPPi]),
        set(&[NTPPi]),
        set(&[TPPi]),
    ],
    // NTPPi
    [
        DR_PPI,
        PO_PPI,
        PO_PPI,
        PO_PPI,
        set(&[PO, TPP, NTPP, TPPi, NTPPi, EQ]),
        set(&[NTPPi]),
        set(&[NTPPi]),
        set(&[NTPPi]),
    ],
    // EQ
    [
        set(&[DC]),
        set(&[EC]),
        set(&[PO]),
        set(&[TPP]),
        set(&[NTPP]),
        set(&[TPPi]),
        set(&[NTPPi]),
        set(&[EQ]),
    ],
];

/// The relations possible between a and c given R(a, b) and S(b, c).
pub fn compose(r: Rcc8, s: Rcc8) -> Rcc8Set {
    TABLE[r as usize][s as usize]
}

/// The RCC-8 relation between two non-empty voxel sets under the given adjacency.
/// `a_surface` must hold every voxel of `a` that has a 26-neighbour outside `a` (see
/// [`Mask::surface`]); likewise `b_surface`.
pub fn relate(
    a: &Mask,
    a_surface: &[[i64; 3]],
    b: &Mask,
    b_surface: &[[i64; 3]],
    adjacency: Adjacency,
) -> Rcc8 {
    relate_counted(a, a_surface, a.count(), b, b_surface, b.count(), adjacency)
}

/// [`relate`] with the two sets' sizes already known.
pub fn relate_counted(
    a: &Mask,
    a_surface: &[[i64; 3]],
    na: usize,
    b: &Mask,
    b_surface: &[[i64; 3]],
    nb: usize,
    adjacency: Adjacency,
) -> Rcc8 {
    let shared = a.intersection_count(b);
    let touches_other = |s: &[[i64; 3]], other: &Mask| {
        s.iter().any(|p| {
            adjacency
                .offsets()
                .iter()
                .any(|o| other.contains([p[0] + o[0], p[1] + o[1], p[2] + o[2]]))
        })
    };
    let reaches_outside = |s: &[[i64; 3]], container: &Mask| {
        s.iter().any(|p| {
            adjacency
                .offsets()
                .iter()
                .any(|o| !container.contains([p[0] + o[0], p[1] + o[1], p[2] + o[2]]))
        })
    };
    if shared == 0 {
        return if touches_other(a_surface, b) { EC } else { DC };
    }
    if shared == na && shared == nb {
        return EQ;
    }
    if shared == na {
        return if reaches_outside(a_surface, b) {
            TPP
        } else {
            NTPP
        };
    }
    if shared == nb {
        return if reaches_outside(b_surface, a) {
            TPPi
        } else {
            NTPPi
        };
    }
    PO
}
