import { View } from 'react-native';
import { heatBudget } from '../../telemetry/math/energy';
import { hazardRadius } from '../../telemetry/math/ice-fall';
import { dewPointC, frostPointC } from '../../telemetry/math/psychrometrics';
import { rfFromPowers } from '../../telemetry/math/rf';
import { cToF, mToFt } from '../../telemetry/math/units';
import { useLayout } from '../theme/breakpoints';
import { space } from '../theme/tokens';
import { Text } from '../ui/text';
import { CalculatorCard, Result } from './calculator-card';
import { useNumberForm, type FieldSpec } from './use-number-form';

const rfFields = { forward: { label: 'Forward power', unit: 'W', initial: '5000', min: 0 }, reflected: { label: 'Reflected power', unit: 'W', initial: '45', min: 0 } } satisfies Record<string, FieldSpec>;
const dewFields = { temp: { label: 'Air temperature', unit: '°C', initial: '-2', min: -60, max: 60 }, rh: { label: 'Relative humidity', unit: '%', initial: '92', min: 1, max: 100 } } satisfies Record<string, FieldSpec>;
const fallFields = { height: { label: 'Height of the ice', unit: 'm', initial: '150', positive: true, max: 1000 }, wind: { label: 'Wind speed', unit: 'm/s', initial: '12', min: 0, max: 80 }, size: { label: 'Chunk size', unit: 'cm', initial: '10', positive: true, max: 200 } } satisfies Record<string, FieldSpec>;
const gridFields = {
  battery: { label: 'Battery capacity', unit: 'kWh', initial: '60', positive: true },
  soc: { label: 'State of charge now', unit: '%', initial: '85', min: 0, max: 100 },
  dod: { label: 'Allowed depth of discharge', unit: '%', initial: '60', positive: true, max: 100 },
  heater: { label: 'Heater power', unit: 'W', initial: '800', min: 0 },
  base: { label: 'Other load', unit: 'W', initial: '250', min: 0 },
  storm: { label: 'Storm length', unit: 'h', initial: '24', positive: true },
  pv: { label: 'Solar array', unit: 'W', initial: '1500', min: 0 },
  sun: { label: 'Peak sun hours in a storm day', unit: 'h', initial: '0.5', min: 0, max: 12 },
  derate: { label: 'Derating of array and battery path', unit: '0–1', initial: '0.75', min: 0, max: 1 },
} satisfies Record<string, FieldSpec>;

const fmt = (n: number, d = 2) => (Number.isFinite(n) ? n.toFixed(d) : '∞');

export function Calculators() {
  const { layout } = useLayout();
  const rf = useNumberForm(rfFields);
  const dew = useNumberForm(dewFields);
  const fall = useNumberForm(fallFields);
  const grid = useNumberForm(gridFields);
  const r = rf.data ? rfFromPowers(rf.data.forward, rf.data.reflected) : null;
  const hz = fall.data ? hazardRadius({ heightM: fall.data.height, windMs: fall.data.wind, chunkSizeM: fall.data.size / 100 }) : null;
  const budget = grid.data
    ? heatBudget({ batteryKwh: grid.data.battery, stateOfCharge: grid.data.soc / 100, depthOfDischarge: grid.data.dod / 100, baseLoadW: grid.data.base, pvArrayW: grid.data.pv, peakSunHours: grid.data.sun, derating: grid.data.derate }, grid.data.heater, grid.data.storm, 1)
    : null;
  return (
    <View style={{ flexDirection: layout === 'phone' ? 'column' : 'row', flexWrap: 'wrap', gap: space.lg }}>
      <View style={{ flex: 1, minWidth: 300, gap: space.lg }}>
        <CalculatorCard title="VSWR and return loss" fields={rfFields} form={rf} note="Figures at the coupler. Through a line, return loss at the transmitter is that at the antenna plus twice the line loss.">
          {r?.kind === 'ok' ? (
            <>
              <Result label="VSWR" value={`${fmt(r.vswr)} : 1`} />
              <Result label="Return loss" value={`${fmt(r.returnLossDb, 1)} dB`} />
              <Result label="|Γ|" value={fmt(r.gamma, 3)} />
              <Result label="Reflected" value={`${fmt(r.reflectedPct, 2)} %`} />
              <Result label="Mismatch loss" value={`${fmt(r.mismatchLossDb, 3)} dB`} />
            </>
          ) : r?.kind === 'no-reading' ? <Text>No reading: the transmitter is off.</Text> : r?.kind === 'fault' ? <Text>Fault: reflected power must be below forward power. Check the coupler.</Text> : null}
        </CalculatorCard>
        <CalculatorCard title="Dew point and frost point" fields={dewFields} form={dew} note="Magnus form, Alduchov & Eskridge 1996 constants.">
          {dew.data ? (
            <>
              <Result label="Dew point" value={`${fmt(dewPointC(dew.data.temp, dew.data.rh), 1)} °C (${fmt(cToF(dewPointC(dew.data.temp, dew.data.rh)), 1)} °F)`} />
              <Result label="Frost point" value={`${fmt(frostPointC(dew.data.temp, dew.data.rh), 1)} °C`} />
            </>
          ) : null}
        </CalculatorCard>
      </View>
      <View style={{ flex: 1, minWidth: 300, gap: space.lg }}>
        <CalculatorCard title="Falling ice" fields={fallFields} form={fall} note="Falling ice can kill. This is a screening figure, not a safe distance: no published tower-specific formula exists. Follow the site safety plan, local codes and licensed practice; wear a hard hat, plan where to stand and where to take cover under something sturdy (a vehicle roof is not enough).">
          {hz ? (
            <>
              <Result label="Keep-clear radius" value={`${fmt(hz.radiusM, 0)} m (${fmt(mToFt(hz.radiusM), 0)} ft)`} />
              <Result label="Fall time" value={`${fmt(hz.fallTimeS, 1)} s`} />
              <Result label="Impact speed" value={`${fmt(hz.impactSpeedMs, 1)} m/s`} />
              <Result label="Impact energy" value={`${fmt(hz.impactEnergyJ, 0)} J`} />
            </>
          ) : null}
        </CalculatorCard>
        <CalculatorCard title="Off-grid heating budget" fields={gridFields} form={grid} note="Sun during the storm counts at the peak sun hours given (0 for the worst case), spread over the day. Sandia SAND87-7023 relations.">
          {budget ? (
            <>
              <Result label="Usable energy now" value={`${fmt(budget.usableNowWh / 1000, 1)} kWh`} />
              <Result label="Can heat for" value={`${fmt(budget.hoursOfHeating, 1)} h`} />
              <Text strong>{budget.canHeatThroughStorm ? 'Enough to heat through this storm.' : 'Not enough to heat through this storm.'}</Text>
            </>
          ) : null}
        </CalculatorCard>
      </View>
    </View>
  );
}
