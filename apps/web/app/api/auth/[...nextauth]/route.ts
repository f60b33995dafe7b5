// GET, POST /api/auth/* – next-auth: csrf, credentials sign-in, session, sign-out
import NextAuth from 'next-auth';
import { authOptions } from '~/server/auth';

const handler = NextAuth(authOptions);

export { handler as GET, handler as POST };
