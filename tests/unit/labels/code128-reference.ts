// Code 128 symbol patterns as bar/space widths in modules (bar first), values 0–106, from the
// Code 128 specification (ISO/IEC 15417, symbol character table). Written out independently of
// jsbarcode so that a test can decode what Decant draws.
export const CODE128_WIDTHS = [
  "212222",
  "222122",
  "222221",
  "121223",
  "121322",
  "131222",
  "122213",
  "122312",
  "132212",
  "221213",
  "221312",
  "231212",
  "112232",
  "122132",
  "122231",
  "113222",
  "123122",
  "123221",
  "223211",
  "221132",
  "221231",
  "213212",
  "223112",
  "312131",
  "311222",
  "321122",
  "321221",
  "312212",
  "322112",
  "322211",
  "212123",
  "212321",
  "232121",
  "111323",
  "131123",
  "131321",
  "112313",
  "132113",
  "132311",
  "211313",
  "231113",
  "231311",
  "112133",
  "112331",
  "132131",
  "113123",
  "113321",
  "133121",
  "313121",
  "211331",
  "231131",
  "213113",
  "213311",
  "213131",
  "311123",
  "311321",
  "331121",
  "312113",
  "312311",
  "332111",
  "314111",
  "221411",
  "431111",
  "111224",
  "111422",
  "121124",
  "121421",
  "141122",
  "141221",
  "112214",
  "112412",
  "122114",
  "122411",
  "142112",
  "142211",
  "241211",
  "221114",
  "413111",
  "241112",
  "134111",
  "111242",
  "121142",
  "121241",
  "114212",
  "124112",
  "124211",
  "411212",
  "421112",
  "421211",
  "212141",
  "214121",
  "412121",
  "111143",
  "111341",
  "131141",
  "114113",
  "114311",
  "411113",
  "411311",
  "113141",
  "114131",
  "311141",
  "411131",
  "211412",
  "211214",
  "211232",
  "2331112",
];

export const START_A = 103;
export const START_B = 104;
export const START_C = 105;
export const STOP = 106;

/** Decodes a module string ("1" bar, "0" space) of a Code 128 symbol (sets A, B and C, no FNC). */
export function decodeCode128(modules: string): { text: string; checksumOk: boolean; values: number[] } {
  // Run-length: widths of alternating bars and spaces.
  const widths: number[] = [];
  for (let i = 0; i < modules.length; ) {
    let j = i;
    while (j < modules.length && modules[j] === modules[i]) j++;
    widths.push(j - i);
    i = j;
  }
  const values: number[] = [];
  let k = 0;
  while (k < widths.length) {
    const take = widths.length - k === 7 ? 7 : 6;
    const pattern = widths.slice(k, k + take).join("");
    const value = CODE128_WIDTHS.indexOf(pattern);
    if (value < 0) throw new Error(`No Code 128 symbol has the widths ${pattern} (at bar ${k})`);
    values.push(value);
    k += take;
  }
  if (values[values.length - 1] !== STOP) throw new Error("No stop symbol");
  const data = values.slice(1, -2);
  const check = values[values.length - 2]!;
  const sum = values[0]! + data.reduce((a, v, i) => a + v * (i + 1), 0);
  if (values[0] !== START_A && values[0] !== START_B && values[0] !== START_C) throw new Error(`Unexpected start symbol ${values[0]}`);
  let set: "A" | "B" | "C" = values[0] === START_C ? "C" : values[0] === START_B ? "B" : "A";
  let text = "";
  for (const v of data) {
    // Code-set switches: 99 → C (from A or B), 100 → B (from A or C), 101 → A (from B or C).
    if (v === 99 && set !== "C") set = "C";
    else if (v === 100 && set !== "B") set = "B";
    else if (v === 101 && set !== "A") set = "A";
    else if (set === "C") text += String(v).padStart(2, "0");
    else if (set === "B") text += String.fromCharCode(v + 32);
    else text += String.fromCharCode(v < 64 ? v + 32 : v - 64);
  }
  return { text, checksumOk: sum % 103 === check, values };
}
