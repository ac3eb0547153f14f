import { describe, expect, it } from 'vitest'
import { brokerAddress } from '../../server/devices/broker-address'

describe('where a device is told to publish', () => {
  it("is this app's host on the embedded broker's port", () => {
    expect(brokerAddress({ port: 18830 })).toEqual({ host: null, port: 18830 })
  })

  // Default ports 1883 (mqtt) and 8883 (mqtts): IANA Service Name and Transport Protocol Port Number Registry.
  it("is the external broker's host and port, with the scheme's default port when none is given", () => {
    expect(brokerAddress({ url: 'mqtt://broker.fishroom.lan:1884', port: 1883 })).toEqual({ host: 'broker.fishroom.lan', port: 1884 })
    expect(brokerAddress({ url: 'mqtt://broker.fishroom.lan', port: 18830 })).toEqual({ host: 'broker.fishroom.lan', port: 1883 })
    expect(brokerAddress({ url: 'mqtts://broker.fishroom.lan', port: 18830 })).toEqual({ host: 'broker.fishroom.lan', port: 8883 })
  })
})
