// Invented words for the demo: the district, its streets, people, companies and assembly makers
// are made up. Any likeness to a real one is a coincidence.

export const firstNames = [
  "Adaeze", "Bram", "Calla", "Dorian", "Elspeth", "Fintan", "Greer", "Hollis", "Ines", "Jory", "Keturah", "Lorcan",
  "Marisol", "Nils", "Odalys", "Perrin", "Quinlan", "Rosalind", "Soren", "Tamsin", "Ulric", "Verity", "Wendeline", "Xanthe",
  "Yusra", "Zebulon", "Anselm", "Briony", "Caspian", "Delphine", "Emrys", "Fenella", "Gideon", "Halcyon", "Isolde", "Jasper",
  "Kestrel", "Linnea", "Merritt", "Noor", "Oriel", "Piran", "Rhiannon", "Sable", "Tobiah", "Undine", "Vashti", "Wilder",
  "Amara", "Benedikt", "Cosima", "Dashiell", "Eulalie", "Florian", "Ginevra", "Hamish", "Ilse", "Jovan", "Kaia", "Leopold",
] as const;

export const lastNames = [
  "Ashgrove", "Bellwater", "Cindermoor", "Dunhallow", "Elderwick", "Fairweather", "Gorseby", "Hartstone", "Ivelworth", "Juniperi",
  "Kettlewell", "Larchmont", "Marrowby", "Nettlefold", "Oakhanger", "Pennywhistle", "Quarrington", "Rookwood", "Saltonstall", "Thistlewood",
  "Underhay", "Vantreight", "Wrenfield", "Yarrowby", "Zennor-Pike", "Amberleigh", "Brackenbury", "Coldharbour", "Drystone", "Emberly",
  "Foxholme", "Greystoke-Ilse", "Hazelrigg", "Inchbrook", "Jessamine", "Kingsmere", "Lowther-Vane", "Millbrook", "Northcote-Ash", "Ormesby",
  "Pilkingham", "Quenby", "Redfern-Hale", "Stoneleigh", "Tarrant-Oake", "Upwood", "Verlaine", "Whitlock-Ray", "Yelverton-Sky", "Zorander",
] as const;

export const streetNames = [
  "Cinderleaf Lane", "Heronwatch Drive", "Lanternfield Road", "Bellwether Street", "Mossgate Avenue", "Tinderbrook Way", "Oxeye Court",
  "Copperbeck Road", "Fernwhistle Lane", "Ambermill Street", "Saltmarrow Drive", "Thistledown Way", "Wrenfold Road", "Gorsewick Lane",
  "Millrace Street", "Pebblecombe Avenue", "Larchwind Drive", "Duskmoor Road", "Quillon Court", "Hollyhock Row", "Kestrel Rise",
  "Old Kiln Road", "Sorrelfield Lane", "Brambleton Avenue", "Candlewick Street", "Driftwell Road", "Emberwood Drive", "Foxglove Terrace",
  "Glimmerbank Way", "Harrowgate Lane", "Inkwell Street", "Juniper Hollow Road", "Knotweed Lane", "Lodestone Avenue", "Marigold Row",
] as const;

export const companyNames = [
  "Quillfeather Backflow Testing", "Tansy Creek Valve Works", "Marrowdale Plumbing & Test", "Hollowell and Daughters Backflow",
  "Sorrel Point Cross-Connection Services", "Ironquill Mechanical", "Fernhollow Test & Repair", "Brassmere Valve Service",
] as const;

/** Invented assembly makers and their model lines, by kind. */
export const makers: Record<string, { make: string; models: Record<string, string[]> }> = {
  tallowmere: { make: "Tallowmere", models: { RP: ["TR-4", "TR-4L"], RPDA: ["TR-4D"], DC: ["TD-2", "TD-2S"], DCDA: ["TD-2D"], PVB: ["TV-1"], SVB: ["TS-1"] } },
  corvane: { make: "Corvane", models: { RP: ["CV-22", "CV-24"], RPDA: ["CV-24D"], DC: ["CV-12"], DCDA: ["CV-12D"], PVB: ["CV-PV"], SVB: ["CV-SV"] } },
  quenby: { make: "Quenby Hydraulics", models: { RP: ["QH-700"], RPDA: ["QH-700DA"], DC: ["QH-300"], DCDA: ["QH-300DA"], PVB: ["QH-90"], SVB: ["QH-95"] } },
  wrexfield: { make: "Wrexfield", models: { RP: ["W-R5"], RPDA: ["W-R5X"], DC: ["W-D3"], DCDA: ["W-D3X"], PVB: ["W-V1"], SVB: ["W-S1"] } },
  halvorne: { make: "Halvorne", models: { RP: ["HV-RP2"], RPDA: ["HV-RP2D"], DC: ["HV-DC2"], DCDA: ["HV-DC2D"], PVB: ["HV-PV"], SVB: ["HV-SV"] } },
};

export const kitMakers = [
  { make: "Gaugewright", model: "DG-5" },
  { make: "Fennick Instruments", model: "Trident-3" },
  { make: "Ostler Test Gear", model: "OT-15D" },
] as const;

export const facilityTypes = [
  { type: "Single-family residence", hazard: "low", weight: 40, name: (last: string) => `${last} residence` },
  { type: "Lawn irrigation", hazard: "high", weight: 14, name: (last: string) => `${last} irrigation` },
  { type: "Restaurant", hazard: "high", weight: 8, name: () => "" },
  { type: "Office building", hazard: "low", weight: 8, name: () => "" },
  { type: "Medical clinic", hazard: "severe", weight: 4, name: () => "" },
  { type: "Dental office", hazard: "high", weight: 3, name: () => "" },
  { type: "Car wash", hazard: "high", weight: 3, name: () => "" },
  { type: "School", hazard: "high", weight: 3, name: () => "" },
  { type: "Laboratory", hazard: "severe", weight: 2, name: () => "" },
  { type: "Metal finishing plant", hazard: "severe", weight: 2, name: () => "" },
  { type: "Apartment building", hazard: "low", weight: 8, name: () => "" },
  { type: "Fire sprinkler service", hazard: "low", weight: 5, name: () => "" },
] as const;

export const businessWords = ["Larkwell", "Copperleaf", "Old Mill", "Riverstone", "Hearthside", "Bluewren", "Saltbox", "Gildersleeve", "Quarrytown", "Amberline", "Mistral", "Harbinger"] as const;

export const locations: Record<string, string[]> = {
  RP: ["meter vault at the street", "mechanical room, north wall", "boiler room", "kitchen branch line", "above-ground enclosure by the curb", "lab sink supply header"],
  RPDA: ["fire line vault", "riser room"],
  DC: ["meter box", "basement at the service entrance", "utility closet", "fire line riser"],
  DCDA: ["fire line vault", "sprinkler riser room"],
  PVB: ["irrigation supply, side yard", "irrigation supply, front yard", "garden bed by the back fence"],
  SVB: ["greenhouse supply", "irrigation manifold"],
  AG: ["tank fill line", "chemical mixing station"],
};
