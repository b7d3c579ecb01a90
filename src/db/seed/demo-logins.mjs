// The demo scenario's sign-ins (one per role). Printed by `npm start`, listed in
// the README, used by the browser tests. Invented people at invented companies.
export const DEMO_PASSWORD = 'fold-and-return';

export const DEMO_LOGINS = [
  { role: 'admin', email: 'admin@northmere.example', name: 'Ines Okafor' },
  { role: 'planner', email: 'planner@northmere.example', name: 'Tomas Brandt' },
  { role: 'yard', email: 'yard@northmere.example', name: 'Rui Almeida' },
  { role: 'customer', email: 'buyer@haldenoils.example', name: 'Greta Lindqvist' },
];

/**
 * A customer user at a second customer organisation, so that what one customer may not see of another can be
 * shown and tested (the isolation test signs in as both). Not one of the four role logins above.
 */
export const SECOND_CUSTOMER_LOGIN = { role: 'customer', email: 'desk@brightwater.example', name: 'Noor Achterberg', organisation: 'Brightwater Syrups' };
