//! An independent DRAT proof checker (forward checking, RUP with a RAT fallback).
//!
//! It parses DIMACS CNF and DRAT text itself and shares no code with the solver or the encoder,
//! so a bug there cannot make a wrong proof pass here. Method: Wetzler, Heule and Hunt, "DRAT-trim:
//! Efficient checking and trimming using expressive clausal proofs", SAT 2014; each lemma must be a
//! reverse unit propagation (RUP) consequence of the clauses so far, or a resolution asymmetric
//! tautology (RAT) on its first literal; the proof must derive the empty clause.

use std::collections::HashMap;

/// Why a proof was rejected.
#[derive(Debug, Clone, PartialEq, Eq, thiserror::Error)]
pub enum DratError {
    /// The CNF text is malformed.
    #[error("CNF line {line}: {message}")]
    Cnf { line: usize, message: String },
    /// The proof text is malformed.
    #[error("proof line {line}: {message}")]
    Proof { line: usize, message: String },
    /// A lemma is neither RUP nor RAT.
    #[error("lemma {index} ({lemma:?}) is not implied")]
    NotImplied { index: usize, lemma: Vec<i32> },
    /// The proof ends without the empty clause.
    #[error("the proof never derives the empty clause")]
    NoEmptyClause,
}

/// What a successful check saw.
#[derive(Debug, Clone, PartialEq, Eq)]
pub struct DratSummary {
    /// Lemmas checked before the empty clause.
    pub lemmas: usize,
    /// Deletions applied.
    pub deletions: usize,
}

/// A parsed DIMACS CNF.
#[derive(Debug, Clone, PartialEq, Eq)]
pub struct ParsedCnf {
    /// Declared variable count.
    pub variables: u32,
    /// Clauses as written.
    pub clauses: Vec<Vec<i32>>,
}

/// Parses DIMACS CNF text (comments `c`, header `p cnf V C`, zero-terminated clauses).
pub fn parse_dimacs(text: &str) -> Result<ParsedCnf, DratError> {
    let mut variables = None;
    let mut declared = 0usize;
    let mut clauses = Vec::new();
    let mut current = Vec::new();
    for (i, line) in text.lines().enumerate() {
        let line = line.trim();
        if line.is_empty() || line.starts_with('c') {
            continue;
        }
        if line.starts_with('p') {
            let parts: Vec<&str> = line.split_whitespace().collect();
            if parts.len() != 4 || parts[1] != "cnf" {
                return Err(DratError::Cnf {
                    line: i + 1,
                    message: "bad header".into(),
                });
            }
            let v = parts[2].parse::<u32>();
            let c = parts[3].parse::<usize>();
            match (v, c) {
                (Ok(v), Ok(c)) => {
                    variables = Some(v);
                    declared = c;
                }
                _ => {
                    return Err(DratError::Cnf {
                        line: i + 1,
                        message: "bad header numbers".into(),
                    });
                }
            }
            continue;
        }
        let Some(max_var) = variables else {
            return Err(DratError::Cnf {
                line: i + 1,
                message: "clause before header".into(),
            });
        };
        for token in line.split_whitespace() {
            let lit: i32 = token.parse().map_err(|_| DratError::Cnf {
                line: i + 1,
                message: format!("not a literal: {token}"),
            })?;
            if lit == 0 {
                clauses.push(std::mem::take(&mut current));
            } else {
                if lit.unsigned_abs() > max_var {
                    return Err(DratError::Cnf {
                        line: i + 1,
                        message: format!("literal {lit} beyond {max_var} variables"),
                    });
                }
                current.push(lit);
            }
        }
    }
    let Some(variables) = variables else {
        return Err(DratError::Cnf {
            line: 0,
            message: "no header".into(),
        });
    };
    if !current.is_empty() {
        return Err(DratError::Cnf {
            line: text.lines().count(),
            message: "last clause not terminated".into(),
        });
    }
    if clauses.len() != declared {
        return Err(DratError::Cnf {
            line: 0,
            message: format!("header says {declared} clauses, found {}", clauses.len()),
        });
    }
    Ok(ParsedCnf { variables, clauses })
}

struct Step {
    delete: bool,
    lits: Vec<i32>,
    line: usize,
}

fn parse_proof(text: &str) -> Result<Vec<Step>, DratError> {
    let mut steps = Vec::new();
    for (i, line) in text.lines().enumerate() {
        let mut tokens = line.split_whitespace().peekable();
        if tokens.peek().is_none() || line.trim_start().starts_with('c') {
            continue;
        }
        let mut delete = false;
        if tokens.peek() == Some(&"d") {
            delete = true;
            tokens.next();
        }
        let mut lits = Vec::new();
        let mut closed = false;
        for token in tokens {
            if closed {
                return Err(DratError::Proof {
                    line: i + 1,
                    message: "text after the terminating 0".into(),
                });
            }
            let lit: i32 = token.parse().map_err(|_| DratError::Proof {
                line: i + 1,
                message: format!("not a literal: {token}"),
            })?;
            if lit == 0 {
                closed = true;
            } else {
                lits.push(lit);
            }
        }
        if !closed {
            return Err(DratError::Proof {
                line: i + 1,
                message: "line does not end with 0".into(),
            });
        }
        steps.push(Step {
            delete,
            lits,
            line: i + 1,
        });
    }
    Ok(steps)
}

/// Literal index for watch lists: 2v for v, 2v+1 for -v.
#[inline]
fn code(l: i32) -> usize {
    (l.unsigned_abs() as usize) * 2 + usize::from(l < 0)
}

struct Checker {
    clauses: Vec<Vec<i32>>,
    alive: Vec<bool>,
    watches: Vec<Vec<u32>>,
    units: Vec<u32>,
    empty_alive: usize,
    lookup: HashMap<Vec<i32>, Vec<u32>>,
    value: Vec<i8>,
    trail: Vec<i32>,
}

impl Checker {
    fn new(variables: u32) -> Checker {
        Checker {
            clauses: Vec::new(),
            alive: Vec::new(),
            watches: vec![Vec::new(); (variables as usize + 1) * 2],
            units: Vec::new(),
            empty_alive: 0,
            lookup: HashMap::new(),
            value: vec![0; variables as usize + 1],
            trail: Vec::new(),
        }
    }

    fn grow(&mut self, lits: &[i32]) {
        let top = lits
            .iter()
            .map(|l| l.unsigned_abs() as usize)
            .max()
            .unwrap_or(0);
        if top >= self.value.len() {
            self.value.resize(top + 1, 0);
            self.watches.resize((top + 1) * 2, Vec::new());
        }
    }

    fn key(lits: &[i32]) -> Vec<i32> {
        let mut k = lits.to_vec();
        k.sort_unstable();
        k.dedup();
        k
    }

    fn add(&mut self, lits: &[i32]) {
        self.grow(lits);
        let lits = Checker::key(lits);
        let id = self.clauses.len() as u32;
        match lits.len() {
            0 => self.empty_alive += 1,
            1 => self.units.push(id),
            _ => {
                self.watches[code(lits[0])].push(id);
                self.watches[code(lits[1])].push(id);
            }
        }
        self.lookup.entry(lits.clone()).or_default().push(id);
        self.clauses.push(lits);
        self.alive.push(true);
    }

    fn delete(&mut self, lits: &[i32]) -> bool {
        let key = Checker::key(lits);
        let Some(ids) = self.lookup.get_mut(&key) else {
            return false;
        };
        let Some(id) = ids.pop() else {
            return false;
        };
        self.alive[id as usize] = false;
        match key.len() {
            0 => self.empty_alive -= 1,
            1 => self.units.retain(|&u| u != id),
            _ => {} // watch lists drop dead clauses lazily
        }
        true
    }

    #[inline]
    fn val(&self, l: i32) -> i8 {
        let v = self.value[l.unsigned_abs() as usize];
        if l < 0 { -v } else { v }
    }

    fn assign(&mut self, l: i32) {
        self.value[l.unsigned_abs() as usize] = if l < 0 { -1 } else { 1 };
        self.trail.push(l);
    }

    fn reset(&mut self) {
        for &l in &self.trail {
            self.value[l.unsigned_abs() as usize] = 0;
        }
        self.trail.clear();
    }

    /// True if assigning the negation of `lits` and unit-propagating yields a conflict.
    fn rup(&mut self, lits: &[i32]) -> bool {
        self.grow(lits);
        let conflict = self.propagate_from(lits);
        self.reset();
        conflict
    }

    fn propagate_from(&mut self, lits: &[i32]) -> bool {
        if self.empty_alive > 0 {
            return true;
        }
        for &l in lits {
            match self.val(l) {
                1 => return true, // tautology: l and -l both in the lemma
                0 => self.assign(-l),
                _ => {}
            }
        }
        for i in 0..self.units.len() {
            let u = self.clauses[self.units[i] as usize][0];
            match self.val(u) {
                -1 => return true,
                0 => self.assign(u),
                _ => {}
            }
        }
        let mut head = 0;
        while head < self.trail.len() {
            let falsified = -self.trail[head];
            head += 1;
            let wc = code(falsified);
            let mut list = std::mem::take(&mut self.watches[wc]);
            let mut keep = 0;
            let mut conflict = false;
            let mut i = 0;
            while i < list.len() {
                let id = list[i];
                i += 1;
                if !self.alive[id as usize] {
                    continue;
                }
                if conflict {
                    list[keep] = id;
                    keep += 1;
                    continue;
                }
                let clause = &mut self.clauses[id as usize];
                if clause[0] == falsified {
                    clause.swap(0, 1);
                }
                let first = clause[0];
                let first_value = {
                    let v = self.value[first.unsigned_abs() as usize];
                    if first < 0 { -v } else { v }
                };
                if first_value == 1 {
                    list[keep] = id;
                    keep += 1;
                    continue;
                }
                let mut moved = false;
                for j in 2..clause.len() {
                    let l = clause[j];
                    let v = self.value[l.unsigned_abs() as usize];
                    let lv = if l < 0 { -v } else { v };
                    if lv != -1 {
                        clause.swap(1, j);
                        let new_watch = clause[1];
                        self.watches[code(new_watch)].push(id);
                        moved = true;
                        break;
                    }
                }
                if moved {
                    continue;
                }
                list[keep] = id;
                keep += 1;
                if first_value == -1 {
                    conflict = true;
                } else {
                    self.assign(first);
                }
            }
            list.truncate(keep);
            // Clauses may have been pushed onto this list meanwhile only if they watch `falsified`
            // anew, which cannot happen (a false literal is never chosen as a new watch).
            let pushed = std::mem::take(&mut self.watches[wc]);
            list.extend(pushed);
            self.watches[wc] = list;
            if conflict {
                return true;
            }
        }
        false
    }

    fn rat(&mut self, lemma: &[i32]) -> bool {
        let Some(&pivot) = lemma.first() else {
            return false;
        };
        let candidates: Vec<u32> = (0..self.clauses.len() as u32)
            .filter(|&id| self.alive[id as usize] && self.clauses[id as usize].contains(&-pivot))
            .collect();
        for id in candidates {
            let mut resolvent: Vec<i32> = lemma.to_vec();
            resolvent.extend(
                self.clauses[id as usize]
                    .iter()
                    .copied()
                    .filter(|&l| l != -pivot),
            );
            if !self.rup(&resolvent) {
                return false;
            }
        }
        true
    }
}

/// Checks that `proof` (DRAT text) refutes `cnf` (DIMACS text).
///
/// # Complexity
/// For each lemma, one unit propagation over the live clauses (watched literals): O(L * size of
/// the formula) in the worst case; RAT checks add a scan of the clauses per lemma.
pub fn check_drat(cnf: &str, proof: &str) -> Result<DratSummary, DratError> {
    let parsed = parse_dimacs(cnf)?;
    let steps = parse_proof(proof)?;
    let mut checker = Checker::new(parsed.variables);
    for c in &parsed.clauses {
        checker.add(c);
    }
    if checker.empty_alive > 0 {
        return Ok(DratSummary {
            lemmas: 0,
            deletions: 0,
        });
    }
    let mut lemmas = 0;
    let mut deletions = 0;
    for (index, step) in steps.iter().enumerate() {
        if step.delete {
            if checker.delete(&step.lits) {
                deletions += 1;
            }
            continue;
        }
        let _ = step.line;
        if !checker.rup(&step.lits) && !checker.rat(&step.lits) {
            return Err(DratError::NotImplied {
                index,
                lemma: step.lits.clone(),
            });
        }
        lemmas += 1;
        if step.lits.is_empty() {
            return Ok(DratSummary { lemmas, deletions });
        }
        checker.add(&step.lits);
    }
    Err(DratError::NoEmptyClause)
}

#[cfg(test)]
mod tests {
    use super::*;

    // All four 2-literal clauses over x1, x2: unsatisfiable; the standard two-step RUP proof
    // "1 0" then "0" (common practice; this is the usual textbook DRAT example).
    const FOUR: &str = "p cnf 2 4\n1 2 0\n1 -2 0\n-1 2 0\n-1 -2 0\n";

    #[test]
    fn accepts_a_short_rup_proof() {
        assert_eq!(
            check_drat(FOUR, "1 0\n0\n"),
            Ok(DratSummary {
                lemmas: 2,
                deletions: 0
            })
        );
    }

    #[test]
    fn rejects_a_lemma_that_is_not_implied() {
        let sat = "p cnf 2 3\n1 2 0\n1 -2 0\n-1 2 0\n";
        assert!(matches!(
            check_drat(sat, "-1 0\n0\n"),
            Err(DratError::NotImplied { index: 0, .. })
        ));
        assert_eq!(check_drat(FOUR, "1 0\n"), Err(DratError::NoEmptyClause));
    }

    #[test]
    fn deletion_removes_support() {
        // Without (1 2), assigning -1 only propagates -2 through (1 -2): no conflict, so "1" is
        // not RUP; its RAT resolvents (1 2) and (1 -2) are not RUP either. It must be rejected.
        assert!(matches!(
            check_drat(FOUR, "d 1 2 0\n1 0\n0\n"),
            Err(DratError::NotImplied { .. })
        ));
    }

    #[test]
    fn rejects_malformed_text() {
        assert!(matches!(
            parse_dimacs("1 2 0\n"),
            Err(DratError::Cnf { .. })
        ));
        assert!(matches!(
            check_drat(FOUR, "1 x 0\n"),
            Err(DratError::Proof { .. })
        ));
    }
}
