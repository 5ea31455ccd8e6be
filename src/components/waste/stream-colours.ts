// Colours for streams in charts and keys: Decant's own palette, chosen for contrast on paper.
const KNOWN: Record<string, string> = {
  aqueous: "#4f86a8",
  "non-halogenated-organic": "#145f66",
  "acidic-corrosive": "#b8731c",
  "basic-corrosive": "#6d5a96",
  "halogenated-organic": "#a12a1f",
  unassigned: "#9a958a",
};
const SPARE = ["#3d7a4a", "#7a4a6b", "#56606b", "#8a7a2a"];

export function streamColour(id: string, index = 0): string {
  return KNOWN[id] ?? SPARE[index % SPARE.length]!;
}
