import { useState } from 'react';
import { View } from 'react-native';

import { useLayout } from '@/components/theme/breakpoints';
import { space } from '@/components/theme/tokens';
import { Button } from '@/components/ui/button';
import { Choice } from '@/components/ui/choice';
import { Text } from '@/components/ui/text';
import { heatBudget } from '@/telemetry/math/energy';
import { type ChunkShape, hazardRadius } from '@/telemetry/math/ice-fall';
import { dewPointC, frostPointC } from '@/telemetry/math/psychrometrics';
import { atAntennaFromTransmitter, rfFromPowers } from '@/telemetry/math/rf';
import { clearSkyPeakSunHours, dayLengthHours, noonElevationDeg } from '@/telemetry/math/sun';
import { cToF, mToFt } from '@/telemetry/math/units';

import { CalculatorCard, Result } from './calculator-card';
import { type FieldSpec, useNumberForm } from './use-number-form';

const rfFields = {
  forward: { label: 'Forward power at the coupler', unit: 'W', initial: '5000', min: 0 },
  reflected: { label: 'Reflected power at the coupler', unit: 'W', initial: '45', min: 0 },
  loss: { label: 'Line loss, coupler to antenna', unit: 'dB', initial: '0.5', min: 0, max: 20 },
} satisfies Record<string, FieldSpec>;
const dewFields = {
  temp: { label: 'Air temperature', unit: '°C', initial: '-2', min: -60, max: 60 },
  rh: { label: 'Relative humidity', unit: '%', initial: '92', min: 1, max: 100 },
} satisfies Record<string, FieldSpec>;
const fallFields = {
  height: { label: 'Height of the ice', unit: 'm', initial: '150', positive: true, max: 1000 },
  wind: { label: 'Wind speed', unit: 'm/s', initial: '12', min: 0, max: 80 },
  size: { label: 'Chunk size (side or diameter)', unit: 'cm', initial: '10', positive: true, max: 200 },
  thick: { label: 'Thickness (plates only)', unit: 'cm', initial: '2', positive: true, max: 200 },
} satisfies Record<string, FieldSpec>;
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

const sunFields = {
  lat: { label: 'Site latitude', unit: '°', initial: '61.2', min: -90, max: 90 },
  month: { label: 'Month', unit: '1–12', initial: String(new Date().getMonth() + 1), min: 1, max: 12 },
} satisfies Record<string, FieldSpec>;

const fmt = (n: number, d = 2) => (Number.isFinite(n) ? n.toFixed(d) : '∞');

export function Calculators() {
  const { layout } = useLayout();
  const rf = useNumberForm(rfFields);
  const dew = useNumberForm(dewFields);
  const fall = useNumberForm(fallFields);
  const grid = useNumberForm(gridFields);
  const sun = useNumberForm(sunFields);
  const sunDate = sun.data ? new Date(Date.UTC(new Date().getUTCFullYear(), Math.round(sun.data.month) - 1, 15)) : null;
  const r = rf.data ? rfFromPowers(rf.data.forward, rf.data.reflected) : null;
  // the same line-loss step the server applies to every reading (telemetry/math/rf)
  const ant =
    rf.data && r?.kind === 'ok' ? atAntennaFromTransmitter(rf.data.forward, rf.data.reflected, rf.data.loss) : null;
  const atAntenna = ant ? rfFromPowers(ant.forwardW, Math.min(ant.reflectedW, ant.forwardW)) : null;
  const [shape, setShape] = useState<ChunkShape>('plate');
  const plateTooThick = shape === 'plate' && fall.data != null && fall.data.thick > fall.data.size;
  const hz =
    fall.data && !plateTooThick
      ? hazardRadius({
          heightM: fall.data.height,
          windMs: fall.data.wind,
          chunkSizeM: fall.data.size / 100,
          shape,
          thicknessM: fall.data.thick / 100,
        })
      : null;
  const budget = grid.data
    ? heatBudget(
        {
          batteryKwh: grid.data.battery,
          stateOfCharge: grid.data.soc / 100,
          depthOfDischarge: grid.data.dod / 100,
          baseLoadW: grid.data.base,
          pvArrayW: grid.data.pv,
          peakSunHours: grid.data.sun,
          derating: grid.data.derate,
        },
        grid.data.heater,
        grid.data.storm,
        1,
      )
    : null;
  return (
    <View style={{ flexDirection: layout === 'phone' ? 'column' : 'row', flexWrap: 'wrap', gap: space.lg }}>
      <View style={{ flex: 1, minWidth: 300, gap: space.lg }}>
        <CalculatorCard
          title="VSWR and return loss"
          fields={rfFields}
          form={rf}
          note="The coupler sits at the transmitter end of the line. A lossy line hides antenna mismatch: return loss at the transmitter is that at the antenna plus twice the line loss, so the antenna is worse than the coupler shows. Thawline's charts, tiles and alarms use the figure at the antenna."
        >
          {r?.kind === 'ok' ? (
            <>
              <Result label="VSWR at the transmitter" value={`${fmt(r.vswr)} : 1`} />
              <Result label="Return loss at the transmitter" value={`${fmt(r.returnLossDb, 1)} dB`} />
              {atAntenna?.kind === 'ok' ? (
                <Result label="VSWR at the antenna" value={`${fmt(atAntenna.vswr)} : 1`} />
              ) : null}
              {atAntenna?.kind === 'ok' ? (
                <Result label="Return loss at the antenna" value={`${fmt(atAntenna.returnLossDb, 1)} dB`} />
              ) : null}
              <Result label="|Γ|" value={fmt(r.gamma, 3)} />
              <Result label="Reflected" value={`${fmt(r.reflectedPct, 2)} %`} />
              <Result label="Mismatch loss" value={`${fmt(r.mismatchLossDb, 3)} dB`} />
            </>
          ) : r?.kind === 'no-reading' ? (
            <Text>No reading: the transmitter is off.</Text>
          ) : r?.kind === 'fault' ? (
            <Text>Fault: reflected power must be below forward power. Check the coupler.</Text>
          ) : null}
        </CalculatorCard>
        <CalculatorCard
          title="Dew point and frost point"
          fields={dewFields}
          form={dew}
          note="Magnus form, Alduchov & Eskridge 1996 constants."
        >
          {dew.data ? (
            <>
              <Result
                label="Dew point"
                value={`${fmt(dewPointC(dew.data.temp, dew.data.rh), 1)} °C (${fmt(cToF(dewPointC(dew.data.temp, dew.data.rh)), 1)} °F)`}
              />
              <Result label="Frost point" value={`${fmt(frostPointC(dew.data.temp, dew.data.rh), 1)} °C`} />
            </>
          ) : null}
        </CalculatorCard>
      </View>
      <View style={{ flex: 1, minWidth: 300, gap: space.lg }}>
        <CalculatorCard
          title="Falling ice"
          fields={fallFields}
          form={fall}
          note="Falling ice can kill. This is a screening figure, not a safe distance: no published tower-specific formula exists. Follow the site safety plan, local codes and licensed practice; wear a hard hat, plan where to stand and where to take cover under something sturdy (a vehicle roof is not enough)."
        >
          <Choice
            label="Shape of the chunk"
            value={shape}
            onChange={setShape}
            options={[
              { value: 'plate', label: 'Plate, falling flat' },
              { value: 'cube', label: 'Cube' },
              { value: 'sphere', label: 'Ball' },
            ]}
          />
          {plateTooThick ? <Text role="alert">A plate cannot be thicker than it is wide.</Text> : null}
          {hz ? (
            <>
              <Result label="Keep-clear radius" value={`${fmt(hz.radiusM, 0)} m (${fmt(mToFt(hz.radiusM), 0)} ft)`} />
              <Result label="Mass of the chunk" value={`${fmt(hz.massKg, hz.massKg < 1 ? 3 : 1)} kg`} />
              <Result label="Fall time" value={`${fmt(hz.fallTimeS, 1)} s`} />
              <Result label="Falling speed at the ground" value={`${fmt(hz.impactSpeedMs, 1)} m/s`} />
              <Result label="Impact speed with the wind" value={`${fmt(hz.resultantSpeedMs, 1)} m/s`} />
              <Result label="Impact energy" value={`${fmt(hz.impactEnergyJ, 0)} J`} />
              <Text variant="small" muted>
                Assumptions: {hz.assumptions.join('; ')}.
              </Text>
            </>
          ) : null}
        </CalculatorCard>
        <CalculatorCard
          title="Off-grid heating budget"
          fields={gridFields}
          form={grid}
          note="Sun during the storm counts at the peak sun hours given (0 for the worst case), spread over the day. Sandia SAND87-7023 relations."
        >
          {budget ? (
            <>
              <Result label="Usable energy now" value={`${fmt(budget.usableNowWh / 1000, 1)} kWh`} />
              <Result label="Can heat for" value={`${fmt(budget.hoursOfHeating, 1)} h`} />
              <Text strong>
                {budget.canHeatThroughStorm
                  ? 'Enough to heat through this storm.'
                  : 'Not enough to heat through this storm.'}
              </Text>
            </>
          ) : null}
        </CalculatorCard>
        <CalculatorCard
          title="Winter sun at a site (estimate)"
          fields={sunFields}
          form={sun}
          note="Clear-sky estimate on a horizontal array for the middle of the month: daily sunlight outside the atmosphere (Duffie & Beckman) × 0.7 clearness (common practice for a clear day). A storm day gives far less, a tilted array more; put your own figure in the budget above."
        >
          {sun.data && sunDate ? (
            <>
              <Result label="Day length" value={`${fmt(dayLengthHours(sun.data.lat, sunDate), 1)} h`} />
              <Result
                label="Sun at noon"
                value={`${fmt(Math.max(0, noonElevationDeg(sun.data.lat, sunDate)), 0)}° above the horizon`}
              />
              <Result
                label="Peak sun hours, clear day (estimate)"
                value={`${fmt(clearSkyPeakSunHours(sun.data.lat, sunDate), 2)} h`}
              />
              <Button
                kind="plain"
                label="Use this estimate in the budget"
                onPress={() => grid.set('sun')(clearSkyPeakSunHours(sun.data!.lat, sunDate).toFixed(2))}
              />
            </>
          ) : null}
        </CalculatorCard>
      </View>
    </View>
  );
}
