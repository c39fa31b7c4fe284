/** The invented people the local OAuth stand-in offers (the Chronos Timing Consortium, an invented group of labs). */
export interface FakeIdentity {
  id: number;
  login: string;
  name: string;
  email: string;
  lab: string;
}

export const FAKE_IDENTITIES: FakeIdentity[] = [
  { id: 910001, login: 'admin', name: 'Ines Valtonen', email: 'ines.valtonen@tempora-lab.example', lab: 'Tempora Lab, Lakeside Institute' },
  { id: 910002, login: 'curator', name: 'Dario Okonkwo-Reyes', email: 'dario.okonkwo@interval-group.example', lab: 'Interval Group, Northfield University' },
  { id: 910003, login: 'coder1', name: 'Mei-Lin Hartwell', email: 'meilin.hartwell@tempora-lab.example', lab: 'Tempora Lab, Lakeside Institute' },
  { id: 910004, login: 'coder2', name: 'Tomasz Brandvold', email: 'tomasz.brandvold@pacemaker-unit.example', lab: 'Pacemaker Unit, Eastbridge College' },
  { id: 910005, login: 'reviewer', name: 'Aurelia Szabo-Finch', email: 'aurelia.szabo@interval-group.example', lab: 'Interval Group, Northfield University' },
  { id: 910006, login: 'reader', name: 'Kofi Lindqvist', email: 'kofi.lindqvist@student.example', lab: 'MSc student, Eastbridge College' },
];
