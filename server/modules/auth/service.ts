import type { DataSource } from 'typeorm';
import { DomainError } from '../../errors';
import { recordAudit } from '../audit/service';
import { User } from '../users/entity';

/** What the OAuth provider tells us about the person signing in. */
export interface ProviderProfile {
  providerId: string;
  login: string;
  name: string | null;
  emails: { value: string; primary?: boolean; verified?: boolean }[];
}

/**
 * Signing in through the provider: finds the user by provider id, or links an account that
 * was created for their verified e-mail (seeded demo users, operator-created users), or creates
 * a new user with no workspace (they join one by invitation).
 */
export function createAuthService(deps: { dataSource: DataSource }) {
  return {
    async signInFromProvider(profile: ProviderProfile): Promise<User> {
      const user = await deps.dataSource.transaction(async (manager) => {
        const users = manager.getRepository(User);
        const known = await users.findOneBy({ providerId: profile.providerId });
        if (known) {
          if (profile.name && profile.name !== known.name) {
            known.name = profile.name.slice(0, 200);
            await users.save(known);
          }
          return known;
        }

        // Only addresses the provider has verified may claim an existing account.
        const verified = profile.emails.filter((e) => e.verified !== false).map((e) => e.value.trim().toLowerCase());
        const primary =
          profile.emails.find((e) => e.primary && e.verified !== false)?.value.trim().toLowerCase() ?? verified[0];
        if (!primary) {
          throw new DomainError('forbidden', 'Your provider account has no verified e-mail address');
        }
        for (const email of verified) {
          const byEmail = await users.findOneBy({ email });
          if (!byEmail) continue;
          if (byEmail.providerId && byEmail.providerId !== profile.providerId) {
            throw new DomainError('conflict', `${email} already belongs to another account`);
          }
          byEmail.providerId = profile.providerId;
          if (byEmail.login !== profile.login && !(await users.existsBy({ login: profile.login }))) byEmail.login = profile.login;
          return users.save(byEmail);
        }

        // A login freed and re-registered at the provider may still be taken here.
        const login = (await users.existsBy({ login: profile.login })) ? `${profile.login}-${profile.providerId}` : profile.login;
        return users.save(
          users.create({ login, email: primary, name: (profile.name || profile.login).slice(0, 200), providerId: profile.providerId }),
        );
      });
      await recordAudit(deps.dataSource, { workspaceId: null, actorId: user.id, action: 'sign-in', detail: { login: user.login } });
      return user;
    },
  };
}
export type AuthService = ReturnType<typeof createAuthService>;
