/** Accounts: sign-up, password change, and the caller's own profile with their teams. */
import 'server-only';
import type { z } from 'zod';
import type { MeDto, UserDto, passwordChangeSchema, signUpSchema } from '../api/contract';
import { db } from '../db';
import { AppError, unauthenticated } from '../errors';
import { hashPassword, verifyPassword } from '../auth/password';
import { userDto } from './dto';
import { listTeams } from './teams';

/** Create an account with a password; 409 `exists` when the address is taken. */
export async function signUp(input: z.output<typeof signUpSchema>): Promise<UserDto> {
  const { User } = db().models;
  const email = input.email.toLowerCase();
  if (await User.findOne({ where: { email }, attributes: ['id'] })) {
    throw new AppError('exists', 'an account with this e-mail already exists', { field: 'email' });
  }
  const passwordHash = await hashPassword(input.password);
  const user = await User.create({ email, name: input.name, passwordHash, emailVerified: null, image: null });
  return userDto(user);
}

/** Change the caller's password after checking the current one (403 when it is wrong). */
export async function changePassword(userId: string, input: z.output<typeof passwordChangeSchema>): Promise<void> {
  const user = await db().models.User.scope('withPassword').findByPk(userId);
  if (!user) throw unauthenticated();
  if (!(await verifyPassword(input.currentPassword, user.passwordHash))) {
    throw new AppError('forbidden', 'the current password is wrong', { field: 'currentPassword' });
  }
  user.passwordHash = await hashPassword(input.newPassword);
  await user.save();
}

/** The caller and the teams they belong to. */
export async function getMe(userId: string): Promise<MeDto> {
  const user = await db().models.User.findByPk(userId);
  if (!user) throw unauthenticated();
  return { user: userDto(user), teams: await listTeams(userId) };
}
