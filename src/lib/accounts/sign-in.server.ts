import bcrypt from 'bcryptjs';
import { CredentialsSignin } from '@auth/core/errors';
import { z } from 'zod';
import { text } from '@/lib/text-input';
import { User } from '@/models';
import { signInLimits, secondsBlocked, hit } from '@/lib/rate-limits.server';
import { CLIENT_IP_HEADER } from '@/lib/client-ip.server';

/** Shown on the sign-in page; the page maps `code` to the words the user reads. */
class TooManyAttempts extends CredentialsSignin {
  code = 'rate_limited';
}
class WrongCredentials extends CredentialsSignin {
  code = 'credentials';
}

const credentialsSchema = z.object({
  email: text().trim().toLowerCase().email().max(254),
  password: text().min(1).max(200),
});

// A hash to compare against when the account does not exist, so a wrong e-mail
// costs the same time as a wrong password and does not reveal which accounts exist.
const DUMMY_HASH = bcrypt.hashSync('not-a-real-password', 10);

export async function authorizeSignIn(raw: unknown, request: Request) {
  const parsed = credentialsSchema.safeParse(raw);
  if (!parsed.success) throw new WrongCredentials();
  const { email, password } = parsed.data;
  const address = request.headers.get(CLIENT_IP_HEADER) ?? 'unknown';

  const accountLimit = signInLimits.account();
  const addressLimit = signInLimits.address();
  if ((await secondsBlocked(accountLimit, email)) || (await secondsBlocked(addressLimit, address))) {
    throw new TooManyAttempts();
  }

  const user = await User.findOne({ where: { email } });
  const ok = await bcrypt.compare(password, user?.passwordHash ?? DUMMY_HASH);
  if (!user || !user.passwordHash || !ok || !user.active) {
    const waits = await Promise.all([hit(accountLimit, email), hit(addressLimit, address)]);
    if (waits.some((w) => w > 0)) throw new TooManyAttempts();
    throw new WrongCredentials();
  }

  await Promise.all([accountLimit.delete(email), User.update({ lastSignInAt: new Date() }, { where: { id: user.id } })]);
  return { id: String(user.id), name: user.name, email: user.email, role: user.role, sessionEpoch: user.sessionEpoch };
}
