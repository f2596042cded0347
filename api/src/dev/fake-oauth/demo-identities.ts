/**
 * The invented people of the local fake OAuth provider. They are not real accounts anywhere;
 * `seedDemo` gives them their demo roles in our database.
 */
import type { AccountRole } from '../../users/user.model';

/** One identity the fake provider can sign in as. */
export interface DemoIdentity {
  /** Numeric id as a string, the way GitHub-style providers send it. */
  readonly id: string;
  readonly login: string;
  readonly name: string;
  readonly email: string;
  /** The role seedDemo gives this account. */
  readonly demoRole: AccountRole;
  /** One line on the picker page, so a developer knows whom to choose. */
  readonly blurb: string;
}

/** The demo identities, least privileged first. */
export const DEMO_IDENTITIES: readonly DemoIdentity[] = [
  { id: '710001', login: 'marguerite-oyelaran', name: 'Marguerite Oyelaran', email: 'marguerite@demo.quarterturn.invalid', demoRole: 'researcher', blurb: 'Researcher: uploads instance sets, submits and replays plans' },
  { id: '710002', login: 'tobiah-venkat', name: 'Tobiah Venkat', email: 'tobiah@demo.quarterturn.invalid', demoRole: 'maintainer', blurb: 'Maintainer: launches sweeps, curates every instance set' },
  { id: '710003', login: 'ilse-marchetti', name: 'Ilse Marchetti', email: 'ilse@demo.quarterturn.invalid', demoRole: 'admin', blurb: 'Admin: manages accounts and roles' },
];

/** The demo identity with `login`, or undefined. */
export function findDemoIdentity(login: string): DemoIdentity | undefined {
  return DEMO_IDENTITIES.find((d) => d.login === login);
}
