import { useMutation, useQuery, useQueryClient } from '@tanstack/react-query';
import { useRouter } from 'next/navigation';
import { useEffect, useRef, useState, type FormEvent } from 'react';
import type { ZodError } from 'zod';
import { ProblemError, sendJson } from '~/lib/api-client';
import {
  customerSearchQuery,
  jobKeys,
  type CustomerMatchJson,
  type JobDetailJson,
} from '~/lib/queries/jobs';
import type { FieldBinding } from './check-in-fields';

export interface CheckInProps {
  technicians: { id: number; name: string }[];
  me: { id: number; role: string };
  suggestion: {
    promisedOn: string;
    businessDays: number;
    basis: 'recent' | 'history' | 'default';
    sampleSize: number;
    today: string;
  };
}

/** Messages by the field's path in the request body ("customer.name", "promisedOn"). */
export type Errors = Record<string, string>;

function collect(error: ZodError, prefix: string, into: Errors) {
  for (const issue of error.issues) {
    const key = [prefix, ...issue.path.map(String)].filter(Boolean).join('.');
    into[key] ??= issue.message;
  }
}

const blankCustomer = { name: '', phone: '', email: '', reminderConsent: false };
const blankReel = {
  kind: '',
  maker: '',
  model: '',
  size: '',
  bearingCount: '',
  gearRatio: '',
  serialNumber: '',
  useProfile: 'light',
  water: 'fresh',
};

type CustomerText = 'name' | 'phone' | 'email';
type ReelText = Exclude<keyof typeof blankReel, 'kind' | 'useProfile' | 'water'>;

/** The check-in form's state, its client-side checks and the request that checks the reel in. */
export function useCheckIn({ me, suggestion }: CheckInProps) {
  const router = useRouter();
  const queryClient = useQueryClient();
  const [query, setQuery] = useState('');
  const [debounced, setDebounced] = useState('');
  const [chosen, setChosen] = useState<CustomerMatchJson | 'new' | null>(null);
  const [customer, setCustomer] = useState(blankCustomer);
  const [reelChoice, setReelChoice] = useState<number | 'new' | null>(null);
  const [reel, setReel] = useState(blankReel);
  const [serviceType, setServiceType] = useState('');
  const [complaint, setComplaint] = useState('');
  const [condition, setCondition] = useState('');
  const [technicianId, setTechnicianId] = useState(me.role === 'technician' ? String(me.id) : '');
  const [promisedOn, setPromisedOn] = useState(suggestion.promisedOn);
  const [errors, setErrors] = useState<Errors>({});
  const [formError, setFormError] = useState<string | null>(null);
  const summaryRef = useRef<HTMLDivElement>(null);
  const [attempt, setAttempt] = useState(0);
  // A field's message goes as soon as it is edited; the rest stay until the next submit.
  const touch = (...paths: string[]) =>
    setErrors((e) => {
      if (!paths.some((p) => p in e)) return e;
      const rest = { ...e };
      for (const p of paths) delete rest[p];
      return rest;
    });
  const editCustomer = (key: keyof typeof blankCustomer, value: string | boolean) => {
    setCustomer((c) => ({ ...c, [key]: value }));
    touch(`customer.${key}`);
  };
  const editReel = (key: keyof typeof blankReel, value: string) => {
    setReel((r) => ({ ...r, [key]: value }));
    touch(`reel.${key}`);
  };
  const bind = (path: string, value: string, set: (value: string) => void): FieldBinding => ({
    path,
    value,
    onChange: (v) => {
      set(v);
      touch(path);
    },
    error: errors[path],
  });
  const customerField = (key: CustomerText): FieldBinding => ({
    path: `customer.${key}`,
    value: customer[key],
    onChange: (v) => editCustomer(key, v),
    error: errors[`customer.${key}`],
  });
  const reelField = (key: ReelText): FieldBinding => ({
    path: `reel.${key}`,
    value: reel[key],
    onChange: (v) => editReel(key, v),
    error: errors[`reel.${key}`],
  });

  useEffect(() => {
    const timer = setTimeout(() => setDebounced(query.trim()), 250);
    return () => clearTimeout(timer);
  }, [query]);
  const search = useQuery(customerSearchQuery(debounced));

  const submit = useMutation({
    mutationFn: (body: unknown) => sendJson<JobDetailJson>('POST', '/api/jobs', body),
    onSuccess: (job) => {
      queryClient.setQueryData(jobKeys.detail(job.id), job);
      void queryClient.invalidateQueries({ queryKey: jobKeys.lists });
      router.push(`/bench/jobs/${job.id}`);
    },
    onError: (error) => {
      setAttempt((n) => n + 1);
      if (error instanceof ProblemError && error.problem.errors?.length) {
        const next: Errors = {};
        for (const e of error.problem.errors) next[e.field.replace(/^body\./, '')] ??= e.message;
        setErrors(next);
        setFormError(null);
      } else {
        setFormError(error.message);
      }
    },
  });

  // Each refused submit moves focus to the summary, so a screen reader hears what to fix.
  useEffect(() => {
    if (attempt > 0) summaryRef.current?.focus();
  }, [attempt]);

  function startNewCustomer() {
    touch('customer');
    const q = query.trim();
    setChosen('new');
    setReelChoice('new');
    setCustomer({
      ...blankCustomer,
      name: /@|\d/.test(q) ? '' : q,
      email: q.includes('@') ? q : '',
      phone: /^[\d+() .-]+$/.test(q) ? q : '',
    });
  }

  function pickCustomer(c: CustomerMatchJson) {
    touch('customer');
    setChosen(c);
    setReelChoice(c.reels.length === 1 ? c.reels[0]!.id : c.reels.length === 0 ? 'new' : null);
  }

  function clearCustomer() {
    setChosen(null);
    setReelChoice(null);
  }

  function pickReel(choice: number | 'new') {
    setReelChoice(choice);
    touch('reel');
  }

  function pickService(s: string) {
    setServiceType(s);
    touch('serviceType');
  }

  async function onSubmit(event: FormEvent) {
    event.preventDefault();
    // The request schema (and zod with it) loads on the first submit, not with the page.
    const { checkInInput, customerInput, reelInput } = await import('~/lib/validators/jobs');
    setAttempt((n) => n + 1);
    const next: Errors = {};
    let customerBody: unknown;
    if (chosen === null) next.customer = 'Find the customer, or add a new one';
    else if (chosen === 'new') {
      const parsed = customerInput.safeParse(customer);
      if (parsed.success) customerBody = parsed.data;
      else collect(parsed.error, 'customer', next);
    } else customerBody = { id: chosen.id };

    let reelBody: unknown;
    if (chosen !== null) {
      if (reelChoice === null) next.reel = 'Pick the reel, or add it';
      else if (reelChoice === 'new') {
        const raw = {
          ...reel,
          kind: reel.kind || undefined,
          bearingCount: reel.bearingCount === '' ? undefined : Number(reel.bearingCount),
        };
        const parsed = reelInput.safeParse(raw);
        if (parsed.success) reelBody = parsed.data;
        else collect(parsed.error, 'reel', next);
      } else reelBody = { id: reelChoice };
    }

    const rest = checkInInput
      .pick({
        serviceType: true,
        complaint: true,
        condition: true,
        technicianId: true,
        promisedOn: true,
      })
      .safeParse({
        serviceType: serviceType || undefined,
        complaint,
        condition,
        technicianId: technicianId ? Number(technicianId) : undefined,
        promisedOn,
      });
    if (!rest.success) collect(rest.error, '', next);
    if (promisedOn && promisedOn < suggestion.today)
      next.promisedOn ??= 'The promised date cannot be in the past';

    setErrors(next);
    setFormError(null);
    if (Object.keys(next).length > 0 || !rest.success) return;
    submit.mutate({ customer: customerBody, reel: reelBody, ...rest.data });
  }

  return {
    errors,
    formError,
    summaryRef,
    onSubmit,
    submitting: submit.isPending,
    customerSearch: {
      query,
      setQuery,
      debounced,
      fetching: search.isFetching,
      data: search.data,
    },
    chosen,
    setChosen,
    clearCustomer,
    startNewCustomer,
    pickCustomer,
    customer,
    editCustomer,
    customerField,
    reelChoice,
    pickReel,
    reel,
    editReel,
    reelField,
    serviceType,
    pickService,
    complaint: bind('complaint', complaint, setComplaint),
    condition: bind('condition', condition, setCondition),
    promisedOn: bind('promisedOn', promisedOn, setPromisedOn),
    technicianId,
    setTechnicianId: (value: string) => {
      setTechnicianId(value);
      touch('technicianId');
    },
  };
}

export type CheckInState = ReturnType<typeof useCheckIn>;
