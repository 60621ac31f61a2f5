// Every command of the engine's command line, in the order `--help` lists them.
import type { EngineCommand } from '../command'
import { command as energy } from './energy'
import { command as nextOrder } from './next-order'
import { command as equilibrium } from './equilibrium'
import { command as convert } from './convert'
import { command as verify } from './verify'
import { command as energyFast } from './energy-fast'
import { command as sample } from './sample'
import { command as minimize } from './minimize'
import { command as stats } from './stats'
import { command as logz } from './logz'

export const commands: EngineCommand[] = [energy, energyFast, nextOrder, equilibrium, convert, sample, minimize, stats, logz, verify]
