/** Demo step: the accounts of the fake provider's invented people, with their demo roles. */
import { DEMO_IDENTITIES } from '../dev/fake-oauth/demo-identities';
import type { DemoSeedStep } from './seed-demo';

/** Creates each demo account once; an existing one (perhaps re-roled by an admin) is left alone. */
export const seedDemoAccounts: DemoSeedStep = async ({ models }) => {
  for (const d of DEMO_IDENTITIES) {
    await models.User.findOrCreate({
      where: { provider: 'fake', providerId: d.id },
      defaults: { provider: 'fake', providerId: d.id, login: d.login, displayName: d.name, email: d.email, role: d.demoRole },
    });
  }
};
