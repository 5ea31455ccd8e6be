/**
 * Molar masses from chemical formulas, computed from CIAAW standard atomic
 * weights (2021). For elements whose standard atomic weight is an interval
 * (H, B, C, N, O, Cl) the CIAAW abridged/conventional value is used.
 */

export const ATOMIC_WEIGHTS: Readonly<Record<string, number>> = Object.freeze({
  H: 1.008,
  B: 10.81,
  C: 12.011,
  N: 14.007,
  O: 15.999,
  F: 18.998403162,
  Na: 22.98976928,
  Mg: 24.305,
  P: 30.973761998,
  S: 32.06,
  Cl: 35.45,
  K: 39.0983,
  Ca: 40.078,
});

/**
 * Element counts of a formula such as `Na2HPO4·12H2O`, `(CH3)2CHOH`,
 * `(HOCH2)3CNH2·HCl`. Parts of a hydrate or adduct are separated by `·`, `*`
 * or `.`, each with an optional leading multiplier.
 */
export function parseFormula(formula: string): Map<string, number> {
  const counts = new Map<string, number>();
  const parts = formula.split(/[·*.]/);
  for (const rawPart of parts) {
    const part = rawPart.trim();
    if (part === "") throw new Error(`Empty part in formula "${formula}".`);
    const lead = /^(\d+)(.*)$/.exec(part);
    const multiplier = lead?.[1] !== undefined ? Number(lead[1]) : 1;
    const body = lead?.[2] ?? part;
    const group = parseGroup(body, formula);
    for (const [el, n] of group) counts.set(el, (counts.get(el) ?? 0) + n * multiplier);
  }
  return counts;
}

function parseGroup(text: string, whole: string): Map<string, number> {
  const stack: Map<string, number>[] = [new Map()];
  let i = 0;
  const readNumber = (): number => {
    let j = i;
    while (j < text.length && text.charCodeAt(j) >= 48 && text.charCodeAt(j) <= 57) j++;
    const n = j > i ? Number(text.slice(i, j)) : 1;
    i = j;
    return n;
  };
  while (i < text.length) {
    const ch = text[i] ?? "";
    if (ch === "(") {
      stack.push(new Map());
      i++;
    } else if (ch === ")") {
      i++;
      const n = readNumber();
      const inner = stack.pop();
      const outer = stack[stack.length - 1];
      if (inner === undefined || outer === undefined || stack.length < 1) throw new Error(`Unbalanced ")" in formula "${whole}".`);
      for (const [el, c] of inner) outer.set(el, (outer.get(el) ?? 0) + c * n);
    } else if (ch >= "A" && ch <= "Z") {
      let sym = ch;
      i++;
      const next = text[i];
      if (next !== undefined && next >= "a" && next <= "z") {
        sym += next;
        i++;
      }
      if (ATOMIC_WEIGHTS[sym] === undefined) throw new Error(`Unknown element "${sym}" in formula "${whole}".`);
      const n = readNumber();
      const top = stack[stack.length - 1];
      if (top === undefined) throw new Error(`Bad formula "${whole}".`);
      top.set(sym, (top.get(sym) ?? 0) + n);
    } else {
      throw new Error(`Unexpected "${ch}" in formula "${whole}".`);
    }
  }
  if (stack.length !== 1 || stack[0] === undefined) throw new Error(`Unbalanced "(" in formula "${whole}".`);
  return stack[0];
}

/** Molar mass in g/mol from the formula (water of crystallisation included). */
export function molarMass(formula: string): number {
  let sum = 0;
  for (const [el, n] of parseFormula(formula)) {
    const w = ATOMIC_WEIGHTS[el];
    if (w === undefined) throw new Error(`Unknown element "${el}".`);
    sum += w * n;
  }
  return sum;
}
