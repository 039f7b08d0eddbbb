import { redirect } from 'next/navigation';
import { getActor } from '@/lib/auth/session';

export default async function Home() {
  redirect((await getActor()) ? '/desk' : '/sign-in');
}
