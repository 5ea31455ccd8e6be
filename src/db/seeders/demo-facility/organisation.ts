// The demo facility's clients, people and projects (all invented).
const stamp = (d: Date) => ({ created_at: d, updated_at: d });

export function organisationRows(t0: Date, passwordHash: string) {
  const clients = [
    { id: 1, name: "Plant Metabolomics Group", kind: "internal", cost_centre: "CC-4102", currency: "EUR", ...stamp(t0) },
    { id: 2, name: "Protein Chemistry Group", kind: "internal", cost_centre: "CC-4217", currency: "EUR", ...stamp(t0) },
    { id: 3, name: "Environmental Trace Analysis Group", kind: "internal", cost_centre: "CC-4330", currency: "EUR", ...stamp(t0) },
    {
      id: 4,
      name: "Quillfeather Therapeutics",
      kind: "external",
      billing_email: "accounts@quillfeather.test",
      currency: "EUR",
      ...stamp(t0),
    },
    { id: 5, name: "Tarnbrook Agritech", kind: "external", billing_email: "payables@tarnbrook.test", currency: "EUR", ...stamp(t0) },
  ];

  const users = [
    { id: 1, email: "admin@demo.test", name: "Alex Morrow", role: "admin", password_hash: passwordHash, ...stamp(t0) },
    { id: 2, email: "manager@demo.test", name: "Priya Castellan", role: "manager", password_hash: passwordHash, ...stamp(t0) },
    { id: 3, email: "tech@demo.test", name: "Rowan Ellery", role: "technician", password_hash: passwordHash, ...stamp(t0) },
    { id: 4, email: "safety@demo.test", name: "Tomasz Werne", role: "safety", password_hash: passwordHash, ...stamp(t0) },
    { id: 5, email: "client@demo.test", name: "Jun Okabe", role: "client", client_id: 4, password_hash: passwordHash, ...stamp(t0) },
    { id: 6, email: "ines.halvorsen@demo.test", name: "Ines Halvorsen", role: "technician", password_hash: passwordHash, ...stamp(t0) },
  ];

  const projects = [
    {
      id: 1,
      code: "PMG-ROOT-26",
      name: "Root exudate profiling",
      client_id: 1,
      contact_name: "Dr. Amara Nkem",
      contact_email: "a.nkem@veldmoor.test",
      ...stamp(t0),
    },
    {
      id: 2,
      code: "PCG-MASS-26",
      name: "Intact mass QC of expressed constructs",
      client_id: 2,
      contact_name: "Dr. Lukas Brenner",
      contact_email: "l.brenner@veldmoor.test",
      ...stamp(t0),
    },
    {
      id: 3,
      code: "ETA-RIVR-26",
      name: "River water screening, spring campaign",
      client_id: 3,
      contact_name: "Dr. Sofia Marrow",
      contact_email: "s.marrow@veldmoor.test",
      ...stamp(t0),
    },
    {
      id: 4,
      code: "QFT-IMP-014",
      name: "Impurity profiling, lead series QF-14",
      client_id: 4,
      contact_name: "Jun Okabe",
      contact_email: "client@demo.test",
      ...stamp(t0),
    },
    {
      id: 5,
      code: "QFT-STB-015",
      name: "Forced-degradation study QF-15",
      client_id: 4,
      contact_name: "Jun Okabe",
      contact_email: "client@demo.test",
      ...stamp(t0),
    },
    {
      id: 6,
      code: "TBA-RES-007",
      name: "Residue panel, cereal extracts",
      client_id: 5,
      contact_name: "Mireille Aubart",
      contact_email: "m.aubart@tarnbrook.test",
      ...stamp(t0),
    },
  ];
  return { clients, users, projects };
}
