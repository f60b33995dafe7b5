import { relations } from 'drizzle-orm';
import { auditAnswers, auditFormItems, auditForms, auditRounds, auditSamples } from './audits';
import { comebacks, rootCauses } from './comebacks';
import { correctiveActions } from './corrective-actions';
import { customers, reels } from './customers';
import { benchSessions, jobEvents, jobs, partLines } from './jobs';
import { photos } from './photos';
import { regions, servicePrices, shops } from './shops';
import { checklistTicks, serviceStandardSteps, serviceStandards } from './standards';
import { users } from './users';

// Relations only serve `db.query.*`; they add no constraints.

export const regionsRelations = relations(regions, ({ many }) => ({
  shops: many(shops),
  managers: many(users),
}));

export const shopsRelations = relations(shops, ({ one, many }) => ({
  region: one(regions, { fields: [shops.regionId], references: [regions.id] }),
  users: many(users),
  servicePrices: many(servicePrices),
}));

export const servicePricesRelations = relations(servicePrices, ({ one }) => ({
  shop: one(shops, { fields: [servicePrices.shopId], references: [shops.id] }),
}));

export const usersRelations = relations(users, ({ one }) => ({
  shop: one(shops, { fields: [users.shopId], references: [shops.id] }),
  region: one(regions, { fields: [users.regionId], references: [regions.id] }),
}));

export const customersRelations = relations(customers, ({ one, many }) => ({
  shop: one(shops, { fields: [customers.shopId], references: [shops.id] }),
  reels: many(reels),
}));

export const reelsRelations = relations(reels, ({ one, many }) => ({
  customer: one(customers, { fields: [reels.customerId], references: [customers.id] }),
  jobs: many(jobs),
}));

export const jobsRelations = relations(jobs, ({ one, many }) => ({
  shop: one(shops, { fields: [jobs.shopId], references: [shops.id] }),
  customer: one(customers, { fields: [jobs.customerId], references: [customers.id] }),
  reel: one(reels, { fields: [jobs.reelId], references: [reels.id] }),
  technician: one(users, { fields: [jobs.technicianId], references: [users.id] }),
  serviceStandard: one(serviceStandards, {
    fields: [jobs.serviceStandardId],
    references: [serviceStandards.id],
  }),
  comebackOf: one(jobs, {
    fields: [jobs.comebackOfJobId],
    references: [jobs.id],
    relationName: 'comebackOf',
  }),
  returns: many(jobs, { relationName: 'comebackOf' }),
  events: many(jobEvents),
  benchSessions: many(benchSessions),
  partLines: many(partLines),
  checklistTicks: many(checklistTicks),
  photos: many(photos),
}));

export const jobEventsRelations = relations(jobEvents, ({ one }) => ({
  job: one(jobs, { fields: [jobEvents.jobId], references: [jobs.id] }),
  user: one(users, { fields: [jobEvents.userId], references: [users.id] }),
}));

export const benchSessionsRelations = relations(benchSessions, ({ one }) => ({
  job: one(jobs, { fields: [benchSessions.jobId], references: [jobs.id] }),
  technician: one(users, { fields: [benchSessions.technicianId], references: [users.id] }),
}));

export const partLinesRelations = relations(partLines, ({ one }) => ({
  job: one(jobs, { fields: [partLines.jobId], references: [jobs.id] }),
}));

export const photosRelations = relations(photos, ({ one }) => ({
  job: one(jobs, { fields: [photos.jobId], references: [jobs.id] }),
}));

export const serviceStandardsRelations = relations(serviceStandards, ({ many }) => ({
  steps: many(serviceStandardSteps),
}));

export const serviceStandardStepsRelations = relations(serviceStandardSteps, ({ one }) => ({
  standard: one(serviceStandards, {
    fields: [serviceStandardSteps.standardId],
    references: [serviceStandards.id],
  }),
}));

export const checklistTicksRelations = relations(checklistTicks, ({ one }) => ({
  job: one(jobs, { fields: [checklistTicks.jobId], references: [jobs.id] }),
  step: one(serviceStandardSteps, {
    fields: [checklistTicks.stepId],
    references: [serviceStandardSteps.id],
  }),
  user: one(users, { fields: [checklistTicks.userId], references: [users.id] }),
}));

export const comebacksRelations = relations(comebacks, ({ one }) => ({
  job: one(jobs, { fields: [comebacks.jobId], references: [jobs.id], relationName: 'returnJob' }),
  originalJob: one(jobs, {
    fields: [comebacks.originalJobId],
    references: [jobs.id],
    relationName: 'originalJob',
  }),
  originalShop: one(shops, { fields: [comebacks.originalShopId], references: [shops.id] }),
  rootCause: one(rootCauses, { fields: [comebacks.rootCauseId], references: [rootCauses.id] }),
  checklistStep: one(serviceStandardSteps, {
    fields: [comebacks.checklistStepId],
    references: [serviceStandardSteps.id],
  }),
  reviewer: one(users, { fields: [comebacks.reviewerId], references: [users.id] }),
}));

export const auditFormsRelations = relations(auditForms, ({ many }) => ({
  items: many(auditFormItems),
}));

export const auditFormItemsRelations = relations(auditFormItems, ({ one }) => ({
  form: one(auditForms, { fields: [auditFormItems.formId], references: [auditForms.id] }),
}));

export const auditRoundsRelations = relations(auditRounds, ({ one, many }) => ({
  shop: one(shops, { fields: [auditRounds.shopId], references: [shops.id] }),
  form: one(auditForms, { fields: [auditRounds.formId], references: [auditForms.id] }),
  auditor: one(users, { fields: [auditRounds.auditorId], references: [users.id] }),
  samples: many(auditSamples),
  correctiveActions: many(correctiveActions),
}));

export const auditSamplesRelations = relations(auditSamples, ({ one, many }) => ({
  round: one(auditRounds, { fields: [auditSamples.roundId], references: [auditRounds.id] }),
  job: one(jobs, { fields: [auditSamples.jobId], references: [jobs.id] }),
  answers: many(auditAnswers),
}));

export const auditAnswersRelations = relations(auditAnswers, ({ one }) => ({
  sample: one(auditSamples, { fields: [auditAnswers.sampleId], references: [auditSamples.id] }),
  item: one(auditFormItems, { fields: [auditAnswers.itemId], references: [auditFormItems.id] }),
}));

export const correctiveActionsRelations = relations(correctiveActions, ({ one }) => ({
  shop: one(shops, { fields: [correctiveActions.shopId], references: [shops.id] }),
  auditRound: one(auditRounds, {
    fields: [correctiveActions.auditRoundId],
    references: [auditRounds.id],
  }),
  comeback: one(comebacks, {
    fields: [correctiveActions.comebackId],
    references: [comebacks.id],
  }),
  owner: one(users, { fields: [correctiveActions.ownerId], references: [users.id] }),
}));
