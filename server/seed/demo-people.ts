/**
 * The invented people of the demo network. The local identity provider offers them as
 * one-click sign-ins and the demo seed gives them their roles; keep both in step through this list.
 */
export interface DemoPerson {
  email: string;
  name: string;
  /** Their role in words, shown on the local sign-in page. */
  note: string;
}

export const demoPeople: DemoPerson[] = [
  { email: 'avery.castellan@benchrelay.test', name: 'Avery Castellan', note: 'Owner of the network' },
  { email: 'rowan.achterberg@benchrelay.test', name: 'Rowan Achterberg', note: 'Regional manager over several shops' },
  { email: 'priya.halloran@benchrelay.test', name: 'Priya Halloran', note: 'Front desk at one shop' },
  {
    email: 'mateo.vanterpool@benchrelay.test',
    name: 'Mateo Vanterpool',
    note: 'Technician at one shop, front desk at another',
  },
  { email: 'ingrid.oyelaran@benchrelay.test', name: 'Ingrid Oyelaran', note: 'Auditor, read-only' },
];
