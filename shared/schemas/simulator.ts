import { z } from 'zod';
import { tagSchema } from './readings.ts';

/** Faults the demo plant can play on a probe, for demos and training. */
export const SIM_FAULTS = ['fouling', 'flatline', 'noisy', 'comms-loss', 'feed-upset', 'pump-trip'] as const;
export const simFaultSchema = z.enum(SIM_FAULTS);
export type SimFault = z.infer<typeof simFaultSchema>;

/**
 * One command to the simulator, from Plant setup (through the API) or the command line.
 * action 'clear' ends that fault; fault 'clear' ends every fault of the probe.
 */
export const simCommandSchema = z.object({
  fault: z.enum([...SIM_FAULTS, 'clear']),
  probeTag: z.string().trim().pipe(tagSchema),
  action: z.enum(['start', 'clear']).default('start'),
});
/** What a sender writes (action may be left out). */
export type SimCommandInput = z.input<typeof simCommandSchema>;
export type SimCommand = z.output<typeof simCommandSchema>;

/** The simulator's retained state: the faults running now. */
export const simStateSchema = z.object({
  faults: z.array(z.object({ fault: simFaultSchema, probeTag: tagSchema, since: z.string() })),
  at: z.string(),
});
export type SimState = z.infer<typeof simStateSchema>;
export type ActiveFault = SimState['faults'][number];
