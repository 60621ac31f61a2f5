// The invented demo scenario: the Harbour Lane group at the Institute for Collective Phenomena
// (both invented), preparing a manuscript on next-order energies of two-dimensional plasmas.
// Every name here is made up. These accounts exist only where the demo seed runs.
// Each account: { id, email, password, displayName, affiliation, siteRole, part } where part says
// what the account shows in the demo.

const affiliation = 'Harbour Lane group, Institute for Collective Phenomena'

/** @type {Array<{ id: string, email: string, password: string, displayName: string, affiliation: string, siteRole: 'admin' | 'member', part: string }>} */
export const demoAccounts = [
  { id: 'demoeditor0000000001', email: 'editor@harbourlane.example', password: 'quill-editor-demo', displayName: 'Ines Varga-Holt', affiliation: 'Editorial office, Journal of Invented Physics', siteRole: 'member', part: 'editor of the demo companion' },
  { id: 'demoauthor0000000001', email: 'author@harbourlane.example', password: 'quill-author-demo', displayName: 'Tomas Ekwueme', affiliation, siteRole: 'member', part: 'author' },
  { id: 'demoauthor0000000002', email: 'coauthor@harbourlane.example', password: 'quill-coauthor-demo', displayName: 'Maren Solvik', affiliation, siteRole: 'member', part: 'second author' },
  { id: 'demoreview0000000001', email: 'reviewer@harbourlane.example', password: 'quill-reviewer-demo', displayName: 'Piet Arandelovic', affiliation: 'Department of Statistical Mechanics, Northmere University (invented)', siteRole: 'member', part: 'reviewer' },
  { id: 'demoreader0000000001', email: 'reader@harbourlane.example', password: 'quill-reader-demo', displayName: 'Lale Okonkwo-Berg', affiliation: 'Northmere University (invented)', siteRole: 'member', part: 'reader' },
  { id: 'demomember0000000001', email: 'member@harbourlane.example', password: 'quill-member-demo', displayName: 'Rui Castellanos', affiliation: 'Independent (invented)', siteRole: 'member', part: 'signed-in member without a role in the companion' },
  { id: 'demoadmin00000000001', email: 'admin@harbourlane.example', password: 'quill-admin-demo', displayName: 'Site Administrator', affiliation: 'Quillfield demo', siteRole: 'admin', part: 'site administrator' },
]

/** @type {{ slug: string, title: string, abstract: string, manuscriptRef: string, members: Array<{ email: string, role: 'reader' | 'reviewer' | 'author' | 'editor' }> }} */
export const demoCompanion = {
  slug: 'plasma-next-order',
  title: 'Next-order energies of two-dimensional plasmas across temperatures',
  abstract: 'We compute the normalised next-order energy of the two-dimensional one-component plasma for N = 100 to 800 points at several inverse temperatures, compare exact samples at β = 2 with Markov-chain samples at larger β and with numerically found ground states, and report pair correlations and bond-orientational order.',
  manuscriptRef: 'HLG-2026-014',
  members: [
    { email: 'editor@harbourlane.example', role: 'editor' },
    { email: 'author@harbourlane.example', role: 'author' },
    { email: 'coauthor@harbourlane.example', role: 'author' },
    { email: 'reviewer@harbourlane.example', role: 'reviewer' },
    { email: 'reader@harbourlane.example', role: 'reader' },
  ],
}
