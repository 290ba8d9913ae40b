/** A tank as the pickers of this feature need it; the app passes the list in from the plant tree. */
export type TankOption = { id: number; tag: string; name: string; circuitTag: string };

export const tankOptions = (tanks: TankOption[]) => tanks.map((t) => ({ value: String(t.id), label: `${t.tag} · ${t.name}` }));
